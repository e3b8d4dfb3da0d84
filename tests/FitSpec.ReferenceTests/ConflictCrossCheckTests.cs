using System.Text.Json;
using FitSpec.ReferenceTests.Support;
using Xunit.Abstractions;
using static FitSpec.ReferenceTests.Support.PublishedSpecs;

namespace FitSpec.ReferenceTests;

/// <summary>
/// The conflicting set an infeasible fit reports, checked by an independent solver: the spec is lowered with
/// only the reported constraints (`fitspec lower --mps`) and GLPK's glpsol (Debian glpk-utils) must find that
/// program infeasible, and feasible again with any one of them left out — so the set conflicts and is
/// irreducible. Data: the stack loss dataset (published/stackloss.csv).
/// </summary>
public sealed class ConflictCrossCheckTests
{
    private static readonly string[] Constraints =
    [
        "air_flow >= 1",
        "acid_conc <= 0",
        "water_temp >= 0.5",
        "air_flow + water_temp <= 1.2",
    ];

    private readonly ITestOutputHelper _output;

    public ConflictCrossCheckTests(ITestOutputHelper output) => _output = output;

    [GlpsolTheory]
    [InlineData("l1")]
    [InlineData("linf")]
    public void Glpsol_confirms_the_reported_set_conflicts_and_needs_every_member(string loss)
    {
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("published/stackloss.csv");
        var result = ws.Solve(ws.WriteSpec("all", Stackloss("all", data, loss, constraints: ConstraintsBlock(Constraints))));
        Assert.Equal("infeasible", result.GetProperty("status").GetString());
        var reported = result.GetProperty("conflict").GetProperty("constraints").EnumerateArray().Select(e => e.GetString()!).ToList();
        Assert.True(result.GetProperty("conflict").GetProperty("irreducible").GetBoolean());
        _output.WriteLine($"{loss}: reported conflict: {string.Join(" | ", reported)}");

        // By hand: air_flow >= 1 and water_temp >= 0.5 give air_flow + water_temp >= 1.5 > 1.2.
        Assert.Equal(["air_flow >= 1", "water_temp >= 0.5", "air_flow + water_temp <= 1.2"], reported);

        // glpsol's plain solution file marks a primal proven to have no feasible point with status 'n'.
        Assert.Equal("no primal feasible point", GlpsolStatus(ws, data, loss, "set", reported));
        for (var k = 0; k < reported.Count; k++)
        {
            var without = reported.Where((_, i) => i != k).ToList();
            var status = GlpsolStatus(ws, data, loss, $"without{k}", without);
            _output.WriteLine($"{loss}: without '{reported[k]}': glpsol {status}");
            Assert.Equal("OPTIMAL", status);
        }
    }

    private static string GlpsolStatus(SpecWorkspace ws, string data, string loss, string name, IReadOnlyList<string> constraints)
    {
        var spec = ws.WriteSpec(name, Stackloss(name, data, loss, constraints: ConstraintsBlock(constraints)));
        var mps = Path.Combine(ws.Folder, "mps", name + ".mps");
        var lower = ExternalProcess.Fitspec(ws.Folder, "lower", spec, "--mps", mps);
        Assert.True(lower.ExitCode == 0 && File.Exists(mps), "fitspec lower: " + lower);
        var solution = Glpsol.SolveFreeMps(mps, presolve: false);
        return solution.PrimalDualStatus.StartsWith("n/", StringComparison.Ordinal) ? "no primal feasible point" : solution.Status;
    }

    private static string ConstraintsBlock(IEnumerable<string> relations) =>
        "constraints: [" + string.Join(", ", relations.Select(r => JsonSerializer.Serialize(r))) + "]";
}
