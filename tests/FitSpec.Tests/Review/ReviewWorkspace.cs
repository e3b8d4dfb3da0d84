using FitSpec.Pipeline;
using FitSpec.Results;
using FitSpec.Tests.Support;
using static FitSpec.Tests.Cli.CliSpecs;

namespace FitSpec.Tests.Review;

/// <summary>
/// Two result folders, "old" and "new", made by running real specs through FitRunner.Run and writing each
/// result with ResultJson.Write, as `fitspec solve --out` lays them out (DIR/&lt;name&gt;.result.json).
/// </summary>
public sealed class ReviewWorkspace : IDisposable
{
    private readonly TempFolder _temp = new("fitspec-review");

    public string Root => _temp.Path;

    public string OldResults => Path.Combine(Root, "old", "out");

    public string NewResults => Path.Combine(Root, "new", "out");

    /// <summary>Writes a file under the workspace (sub-folders created); returns its full path.</summary>
    public string Write(string relative, string text)
    {
        var full = Path.Combine(Root, relative);
        Directory.CreateDirectory(Path.GetDirectoryName(full)!);
        File.WriteAllText(full, text);
        return full;
    }

    /// <summary>Solves SIDE/NAME.fit.yaml (written from <paramref name="spec"/>) and writes SIDE/out/NAME.result.json.</summary>
    public FitResult Solve(string side, string name, string spec)
    {
        var result = FitRunner.Run(Write(Path.Combine(side, name + ".fit.yaml"), spec));
        Write(Path.Combine(side, "out", result.Name + ".result.json"), ResultJson.Write(result));
        return result;
    }

    public void Dispose() => _temp.Dispose();
}

/// <summary>
/// The change under review, in both folders: 'steady' is the same; 'bounded' gains a constraint (spec
/// edited); 'gauge' gets one data point moved so that its acceptance rule flips from PASS to FAIL (data
/// changed); 'retired' is only old, 'fresh' only new. The data is invented: these tests check behaviour.
/// </summary>
public sealed class ReviewScenario : IDisposable
{
    public const string GaugeRule = "max_abs_residual <= 0.5";

    /// <summary>SampleData with the row x = 3 moved from 6.2 to 9.0 (line 4 of the file).</summary>
    public const string MovedPoint = "x,y\n1,2.1\n2,3.9\n3,9.0\n4,7.8\n5,10.1\n6,12.2\n";

    public ReviewScenario()
    {
        foreach (var side in new[] { "old", "new" })
        {
            Workspace.Write(Path.Combine(side, "d.csv"), SampleData);
        }

        Workspace.Write(Path.Combine("old", "g.csv"), SampleData);
        Workspace.Write(Path.Combine("new", "g.csv"), MovedPoint);
        var gauge = Linear("gauge", "g.csv", tail: $"report:\n  accept:\n    - \"{GaugeRule}\"\n");

        Old = new Dictionary<string, FitResult>
        {
            ["steady"] = Workspace.Solve("old", "steady", Linear("steady")),
            ["bounded"] = Workspace.Solve("old", "bounded", Linear("bounded")),
            ["gauge"] = Workspace.Solve("old", "gauge", gauge),
            ["retired"] = Workspace.Solve("old", "retired", Linear("retired")),
        };
        New = new Dictionary<string, FitResult>
        {
            ["steady"] = Workspace.Solve("new", "steady", Linear("steady")),
            ["bounded"] = Workspace.Solve("new", "bounded", Linear("bounded", tail: "constraints:\n  - \"b1 <= 1.9\"\n")),
            ["gauge"] = Workspace.Solve("new", "gauge", gauge),
            ["fresh"] = Workspace.Solve("new", "fresh", Linear("fresh")),
        };
        foreach (var r in Old.Values.Concat(New.Values))
        {
            Assert.True(r.Status == "optimal", $"{r.Name}: {r.Status} {r.StatusDetail}");
        }
    }

    public ReviewWorkspace Workspace { get; } = new();

    public IReadOnlyDictionary<string, FitResult> Old { get; }

    public IReadOnlyDictionary<string, FitResult> New { get; }

    public void Dispose() => Workspace.Dispose();
}
