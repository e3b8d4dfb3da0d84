using FitSpec.Spec;
using YamlDotNet.Core;
using YamlDotNet.RepresentationModel;

namespace FitSpec.Design;

/// <summary>
/// Where `terms:` is written inside `model:`, for errors about the terms as a whole (too few rows for them).
/// The typed spec keeps the model's and each term's position but not this key's, so the spec file is read again,
/// only on that error path; when it cannot be (changed or gone since), the model's position stands in.
/// </summary>
internal static class TermsKeyPosition
{
    public static SourcePos Of(FitSpecDocument spec)
    {
        try
        {
            using var reader = new StreamReader(spec.File);
            var stream = new YamlStream();
            stream.Load(reader);
            if (stream.Documents.Count > 0
                && stream.Documents[0].RootNode is YamlMappingNode root
                && root.Children.TryGetValue(new YamlScalarNode("model"), out var model)
                && model is YamlMappingNode map)
            {
                var key = map.Children.Keys.FirstOrDefault(k => k is YamlScalarNode { Value: "terms" });
                if (key is not null)
                {
                    return new SourcePos(spec.File, (int)key.Start.Line, (int)key.Start.Column);
                }
            }
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or YamlException)
        {
        }

        return spec.Model.Pos;
    }
}
