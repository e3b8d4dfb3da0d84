using System.Text;
using System.Text.RegularExpressions;
using FitSpec.Spec;

namespace FitSpec.Fuzz.Harness;

/// <summary>
/// The real inputs mutations start from: the demo specs (specs/*.fit.yaml), the YAML examples of the
/// language contract (SPEC.md, in the shared folder beside the repository), the demo data files, and every
/// expression those specs contain. Loaded in a fixed order so a seeded run sees the same seeds every time.
/// </summary>
public sealed partial class Corpus
{
    private Corpus(string root, List<NamedBytes> specs, List<NamedBytes> data, List<string> expressions)
    {
        RepositoryRoot = root;
        Specs = specs;
        DemoData = data;
        Expressions = expressions;
    }

    public string RepositoryRoot { get; }

    public IReadOnlyList<NamedBytes> Specs { get; }

    /// <summary>specs/data/*: copied into every workspace as data/NAME, where the demo specs look for it.</summary>
    public IReadOnlyList<NamedBytes> DemoData { get; }

    public IReadOnlyList<string> Expressions { get; }

    public static Corpus Load(string? repositoryRoot = null)
    {
        var root = repositoryRoot ?? FindRepositoryRoot()
            ?? throw new InvalidOperationException("cannot find the repository (a folder with FitSpec.sln) above the current folder or the program; pass --repo");
        var specs = new List<NamedBytes>();
        foreach (var file in Directory.GetFiles(Path.Combine(root, "specs"), "*.fit.yaml").Order(StringComparer.Ordinal))
        {
            specs.Add(new NamedBytes(Path.GetFileName(file), File.ReadAllBytes(file)));
        }

        if (FindLanguageContract(root) is { } contract)
        {
            var blocks = YamlBlock().Matches(File.ReadAllText(contract));
            for (var i = 0; i < blocks.Count; i++)
            {
                specs.Add(new NamedBytes($"SPEC.md example {i + 1}", Encoding.UTF8.GetBytes(blocks[i].Groups[1].Value)));
            }
        }

        var data = new List<NamedBytes>();
        foreach (var file in Directory.GetFiles(Path.Combine(root, "specs", "data")).Order(StringComparer.Ordinal))
        {
            data.Add(new NamedBytes(Path.GetFileName(file), File.ReadAllBytes(file)));
        }

        return new Corpus(root, specs, data, CollectExpressions(specs));
    }

    /// <summary>The folder holding FitSpec.sln, looked for above the working folder and above the program.</summary>
    public static string? FindRepositoryRoot()
    {
        foreach (var start in new[] { Environment.CurrentDirectory, AppContext.BaseDirectory })
        {
            for (var dir = new DirectoryInfo(start); dir is not null; dir = dir.Parent)
            {
                if (File.Exists(Path.Combine(dir.FullName, "FitSpec.sln")))
                {
                    return dir.FullName;
                }
            }
        }

        return null;
    }

    private static string? FindLanguageContract(string root)
    {
        var candidates = new List<string> { Path.Combine(Directory.GetParent(root)?.FullName ?? root, "shared", "SPEC.md") };
        if (Environment.GetEnvironmentVariable("FITSPEC_REFERENCE_DIR") is { Length: > 0 } reference)
        {
            candidates.Add(Path.Combine(Path.GetDirectoryName(Path.GetFullPath(reference).TrimEnd('/')) ?? reference, "SPEC.md"));
        }

        return candidates.FirstOrDefault(File.Exists);
    }

    // Every expression the seed specs write, read through the real spec reader (seeds that do not read, such as
    // SPEC.md's "every form at once" example, still give what their valid parts hold via a lenient pass below).
    private static List<string> CollectExpressions(List<NamedBytes> specs)
    {
        var found = new List<string>();
        foreach (var spec in specs)
        {
            var read = SpecReader.Parse(spec.Name, spec.Bytes);
            if (read.Document is { } doc)
            {
                found.Add(doc.Model.Response.Value);
                found.AddRange(doc.Model.Terms.OfType<ExpressionTerm>().Select(t => t.Expression.Value));
                found.AddRange(new[] { doc.Data.Filter?.Value, doc.Data.Weight?.Value }.OfType<string>());
                found.AddRange(doc.Constraints.OfType<RelationConstraint>().Select(c => c.Label));
                found.AddRange(doc.Report.Accept.Select(a => a.Value));
            }

            foreach (Match m in QuotedValue().Matches(Encoding.UTF8.GetString(spec.Bytes)))
            {
                found.Add(m.Groups[1].Value);
            }
        }

        return found.Where(e => e.Length > 0).Distinct(StringComparer.Ordinal).ToList();
    }

    [GeneratedRegex(@"```yaml\n(.*?)```", RegexOptions.Singleline)]
    private static partial Regex YamlBlock();

    [GeneratedRegex("\"([^\"\\n]*[<>=+*/^()][^\"\\n]*)\"")]
    private static partial Regex QuotedValue();
}

/// <summary>A seed file: where it came from and its bytes.</summary>
public sealed record NamedBytes(string Name, byte[] Bytes);
