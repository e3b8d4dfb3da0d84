using System.Text.Json;
using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using FitSpec.Spec.Schema;
using FitSpec.Tests.Cli;
using Json.Schema;

namespace FitSpec.Tests.Spec;

/// <summary>Validates YAML specs against the generated JSON Schema with an independent validator.</summary>
internal static partial class SchemaCheck
{
    private static readonly Lazy<JsonSchema> Schema = new(() => JsonSchema.FromText(SchemaGenerator.Generate()));

    public static string CommittedSchemaPath => Path.Combine(CliHarness.RepositoryRoot(), "schema", "fitspec.schema.json");

    /// <summary>The schema's complaints about a spec (empty when it validates).</summary>
    public static IReadOnlyList<string> Errors(string yaml) => Errors(YamlJson.Convert(yaml));

    public static IReadOnlyList<string> Errors(JsonNode? instance)
    {
        using var doc = JsonDocument.Parse(instance?.ToJsonString() ?? "null");
        var result = Schema.Value.Evaluate(doc.RootElement, new EvaluationOptions { OutputFormat = OutputFormat.List });
        if (result.IsValid)
        {
            return [];
        }

        var messages = (result.Details ?? [])
            .Where(d => d.Errors is { Count: > 0 })
            .SelectMany(d => d.Errors!.Select(e => $"{d.InstanceLocation} ({d.EvaluationPath}): {e.Key}: {e.Value}"))
            .ToList();
        return messages.Count > 0 ? messages : ["invalid (no details)"];
    }

    /// <summary>The YAML code blocks of a Markdown file (```yaml fences).</summary>
    public static IReadOnlyList<string> YamlBlocks(string markdown) =>
        [.. YamlFence().Matches(markdown.Replace("\r\n", "\n", StringComparison.Ordinal)).Select(m => m.Groups[1].Value)];

    /// <summary>
    /// SPEC.md, the language contract: in the shared folder beside the repository, or beside the reference folder
    /// that FITSPEC_REFERENCE_DIR names (how a clone elsewhere finds the shared folder).
    /// </summary>
    public static string SpecContractPath()
    {
        var root = new DirectoryInfo(CliHarness.RepositoryRoot());
        var beside = Path.Combine(root.Parent?.FullName ?? root.FullName, "shared", "SPEC.md");
        var candidates = new List<string> { beside };
        if (Environment.GetEnvironmentVariable("FITSPEC_REFERENCE_DIR") is { Length: > 0 } reference)
        {
            candidates.Add(Path.Combine(Path.GetDirectoryName(Path.GetFullPath(reference).TrimEnd('/')) ?? reference, "SPEC.md"));
        }

        var path = candidates.FirstOrDefault(File.Exists);
        Assert.True(path is not null, $"the spec language contract is expected at {beside} (../shared/SPEC.md beside the repository) or beside FITSPEC_REFERENCE_DIR");
        return path!;
    }

    [GeneratedRegex("^```yaml\\n(.*?)^```", RegexOptions.Multiline | RegexOptions.Singleline)]
    private static partial Regex YamlFence();
}
