using System.Globalization;
using FitSpec.Diagnostics;
using FitSpec.Spec.Schema;
using YamlDotNet.Core;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Spec;

/// <summary>
/// Reads typed values out of YAML nodes, recording a located diagnostic for every wrong type, unknown key or
/// out-of-range value instead of stopping at the first.
/// </summary>
internal sealed class YamlFields
{
    private readonly List<Diagnostic> _errors;
    private readonly Action<SectionGrammar, string>? _onKeyRead;

    /// <param name="onKeyRead">Told of every key a reader asks for (tests use it to find grammar keys no reader reads).</param>
    public YamlFields(string file, List<Diagnostic> errors, Action<SectionGrammar, string>? onKeyRead = null)
    {
        File = file;
        _errors = errors;
        _onKeyRead = onKeyRead;
    }

    public string File { get; }

    public SourcePos Pos(YamlNode node) => new(File, (int)node.Start.Line, (int)node.Start.Column);

    public void Error(YamlNode node, string? field, string message) => Error(Pos(node), field, message);

    public void Error(SourcePos pos, string? field, string message) =>
        _errors.Add(new Diagnostic(pos.File, pos.Line, pos.Column, field, message));

    /// <summary>
    /// The mapping's entries by key, after rejecting keys that <paramref name="section"/> does not define
    /// (with a did-you-mean) and duplicate keys.
    /// </summary>
    public SectionEntries Entries(YamlMappingNode map, string where, SectionGrammar section)
    {
        ArgumentNullException.ThrowIfNull(section);
        var allowed = section.Names;
        var result = new Dictionary<string, (YamlScalarNode, YamlNode)>(StringComparer.Ordinal);
        foreach (var (keyNode, value) in map.Children)
        {
            if (keyNode is not YamlScalarNode { Value: { } key } scalarKey)
            {
                Error(keyNode, null, $"keys in {where} must be plain names");
                continue;
            }

            if (!allowed.Contains(key))
            {
                var hint = NameSuggester.Hint(key, allowed);
                Error(keyNode, key, $"unknown key '{key}' in {where}{hint}; allowed: {string.Join(", ", allowed)}");
                continue;
            }

            if (!result.TryAdd(key, (scalarKey, value)))
            {
                Error(keyNode, key, $"duplicate key '{key}' in {where}");
            }
        }

        return new SectionEntries(section, result, _onKeyRead);
    }

    public YamlMappingNode? Mapping(YamlNode node, string field)
    {
        if (node is YamlMappingNode map)
        {
            return map;
        }

        Error(node, field, $"'{field}' must be a mapping (key: value lines)");
        return null;
    }

    public YamlSequenceNode? Sequence(YamlNode node, string field)
    {
        if (node is YamlSequenceNode seq)
        {
            return seq;
        }

        Error(node, field, $"'{field}' must be a list");
        return null;
    }

    public SpecText? Text(YamlNode node, string field)
    {
        if (node is YamlScalarNode { Value: { } value } scalar)
        {
            var shift = scalar.Style is ScalarStyle.SingleQuoted or ScalarStyle.DoubleQuoted ? 1 : 0;
            return new SpecText(value, Pos(node), shift);
        }

        Error(node, field, $"'{field}' must be a single value (text), not a {Describe(node)}");
        return null;
    }

    public double? Number(YamlNode node, string field)
    {
        if (node is YamlScalarNode { Value: { } value }
            && double.TryParse(value, NumberStyles.Float, CultureInfo.InvariantCulture, out var d)
            && double.IsFinite(d))
        {
            return d;
        }

        Error(node, field, $"'{field}' must be a finite number, got {Show(node)}");
        return null;
    }

    public int? Integer(YamlNode node, string field)
    {
        if (node is YamlScalarNode { Value: { } value }
            && int.TryParse(value, NumberStyles.Integer, CultureInfo.InvariantCulture, out var i))
        {
            return i;
        }

        Error(node, field, $"'{field}' must be a whole number, got {Show(node)}");
        return null;
    }

    /// <summary>A list of texts; a single scalar is accepted as a one-item list.</summary>
    public IReadOnlyList<SpecText>? TextList(YamlNode node, string field)
    {
        if (node is YamlScalarNode)
        {
            return Text(node, field) is { } single ? [single] : null;
        }

        if (Sequence(node, field) is not { } seq)
        {
            return null;
        }

        var items = new List<SpecText>();
        foreach (var item in seq.Children)
        {
            if (Text(item, field) is { } t)
            {
                items.Add(t);
            }
        }

        return items;
    }

    /// <summary>A mapping of input name to number, in written order (used by at:).</summary>
    public IReadOnlyList<KeyValuePair<string, double>>? NumberMap(YamlNode node, string field)
    {
        if (Mapping(node, field) is not { } map)
        {
            return null;
        }

        var result = new List<KeyValuePair<string, double>>();
        var seen = new HashSet<string>(StringComparer.Ordinal);
        foreach (var (k, v) in map.Children)
        {
            if (k is not YamlScalarNode { Value: { } key })
            {
                Error(k, field, $"keys in '{field}' must be input names");
                continue;
            }

            if (!seen.Add(key))
            {
                Error(k, field, $"duplicate input '{key}' in '{field}'");
                continue;
            }

            if (Number(v, $"{field}.{key}") is { } d)
            {
                result.Add(new(key, d));
            }
        }

        return result;
    }

    /// <summary>Words joined for a message: "a", "a or b", "a, b or c".</summary>
    public static string Or(IReadOnlyList<string> words) =>
        words.Count <= 1 ? string.Concat(words) : $"{string.Join(", ", words.Take(words.Count - 1))} or {words[^1]}";

    public static string Describe(YamlNode node) => node switch
    {
        YamlMappingNode => "mapping",
        YamlSequenceNode => "list",
        _ => "value",
    };

    private static string Show(YamlNode node) =>
        node is YamlScalarNode { Value: { } v } ? $"'{v}'" : $"a {Describe(node)}";
}
