using System.Globalization;
using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using YamlDotNet.Core;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Tests.Spec;

/// <summary>
/// Converts a YAML document to JSON the way a schema-aware YAML editor sees it: plain scalars are
/// typed by the YAML 1.2 core schema (null, booleans, integers, floats), everything else is a string.
/// </summary>
internal static partial class YamlJson
{
    public static JsonNode? Convert(string yaml)
    {
        var stream = new YamlStream();
        stream.Load(new StringReader(yaml));
        Assert.Single(stream.Documents);
        return Convert(stream.Documents[0].RootNode);
    }

    public static JsonNode? Convert(YamlNode node) => node switch
    {
        YamlMappingNode map => Mapping(map),
        YamlSequenceNode seq => new JsonArray([.. seq.Children.Select(Convert)]),
        YamlScalarNode scalar => Scalar(scalar),
        _ => throw new InvalidOperationException($"unexpected YAML node {node.GetType().Name}"),
    };

    private static JsonObject Mapping(YamlMappingNode map)
    {
        var result = new JsonObject();
        foreach (var (key, value) in map.Children)
        {
            result[((YamlScalarNode)key).Value!] = Convert(value);
        }

        return result;
    }

    private static JsonNode? Scalar(YamlScalarNode scalar)
    {
        var text = scalar.Value ?? "";
        if (scalar.Style is not (ScalarStyle.Plain or ScalarStyle.Any))
        {
            return JsonValue.Create(text);
        }

        if (NullWord().IsMatch(text))
        {
            return null;
        }

        if (BoolWord().IsMatch(text))
        {
            return JsonValue.Create(text[0] is 't' or 'T');
        }

        if (DecimalInteger().IsMatch(text) && long.TryParse(text, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out var whole))
        {
            return JsonValue.Create(whole);
        }

        if (Float().IsMatch(text))
        {
            return JsonValue.Create(double.Parse(text, NumberStyles.Float, CultureInfo.InvariantCulture));
        }

        return JsonValue.Create(text);
    }

    [GeneratedRegex("^(null|Null|NULL|~|)$")]
    private static partial Regex NullWord();

    [GeneratedRegex("^(true|True|TRUE|false|False|FALSE)$")]
    private static partial Regex BoolWord();

    [GeneratedRegex("^[-+]?[0-9]+$")]
    private static partial Regex DecimalInteger();

    [GeneratedRegex("^[-+]?(\\.[0-9]+|[0-9]+(\\.[0-9]*)?)([eE][-+]?[0-9]+)?$")]
    private static partial Regex Float();
}
