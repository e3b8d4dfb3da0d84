using YamlDotNet.RepresentationModel;

namespace FitSpec.ClusterTests.Support;

/// <summary>A Kubernetes manifest file read as YAML, with the paths the tests look up.</summary>
public sealed class Manifest
{
    private Manifest(IReadOnlyList<YamlMappingNode> documents) => Documents = documents;

    public IReadOnlyList<YamlMappingNode> Documents { get; }

    public static Manifest Load(string path)
    {
        var stream = new YamlStream();
        using (var reader = new StreamReader(path))
        {
            stream.Load(reader);
        }

        return new Manifest(stream.Documents.Select(d => Assert.IsType<YamlMappingNode>(d.RootNode)).ToList());
    }

    /// <summary>The one document of kind Job (fails when there is none or more than one).</summary>
    public YamlMappingNode SingleJob() => Assert.Single(Documents, d => Scalar(d, "kind") == "Job");

    /// <summary>The scalar at a dotted path of mapping keys, or null when any step is missing.</summary>
    public static string? Scalar(YamlNode node, string path) => Node(node, path) is YamlScalarNode s ? s.Value : null;

    public static YamlNode? Node(YamlNode node, string path)
    {
        var current = node;
        foreach (var key in path.Split('.'))
        {
            if (current is not YamlMappingNode map || !map.Children.TryGetValue(new YamlScalarNode(key), out var next))
            {
                return null;
            }

            current = next;
        }

        return current;
    }

    public static IReadOnlyList<YamlNode> Sequence(YamlNode node, string path) =>
        Node(node, path) is YamlSequenceNode seq ? seq.Children.ToList() : [];

    /// <summary>The Job's pod template's only container.</summary>
    public static YamlNode SingleContainer(YamlMappingNode job) => Assert.Single(Sequence(job, "spec.template.spec.containers"));

    /// <summary>A container's command and args as one word list, as the container starts them.</summary>
    public static IReadOnlyList<string> CommandLine(YamlNode container) =>
        Sequence(container, "command").Concat(Sequence(container, "args")).Select(n => Assert.IsType<YamlScalarNode>(n).Value ?? "").ToList();
}
