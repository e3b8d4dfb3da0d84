using FitSpec.ReferenceTests.Support;
using Xunit.Abstractions;
using static FitSpec.ReferenceTests.Support.PublishedSpecs;

namespace FitSpec.ReferenceTests;

/// <summary>
/// The count penalty on Brownlee's stack-loss data with the l1 loss (published/stackloss.lad.json):
/// (a) a count that allows every slope, with bounds far from the LAD fit, must leave the published LAD optimum
/// unchanged (its binaries and big-M rows restrict nothing); (b) the MILP FitSpec lowers for a binding count is
/// exported with `fitspec lower --mps` and solved by GLPK's glpsol (Debian glpk-utils) on its own — its integer
/// optimum must equal the result.json objective, and the slopes left out must be exactly 0.
/// </summary>
public sealed class CountPenaltyReferenceTests
{
    private const string LadFile = "published/stackloss.lad.json";

    // Bounds for the count's big-M rows: the published LAD slopes are 0.83, 0.57 and -0.06 (stackloss.lad.json),
    // so ±10 is inactive there.
    private const string Bounds = """
        penalties:
          - {kind: count, max: MAX, on: [air_flow, water_temp, acid_conc]}
        constraints:
          - {kind: bounds, on: [air_flow, water_temp, acid_conc], min: -10, max: 10}
        """;

    private static readonly string[] Slopes = ["air_flow", "water_temp", "acid_conc"];

    private readonly ITestOutputHelper _output;

    public CountPenaltyReferenceTests(ITestOutputHelper output) => _output = output;

    [ReferenceFact]
    public void A_count_that_allows_every_slope_reproduces_the_published_lad_fit()
    {
        var table = new AgreementTable();
        table.Source(LadFile);
        var reference = ReferenceData.Json(LadFile);
        var lad = reference.GetProperty("lad");
        var objectiveTol = AgreementTable.HintTolerance(reference, "objective", "relative");
        var coefTol = AgreementTable.HintTolerance(reference, "coefficients", "max(1, |b_ref|)");
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("published/stackloss.csv");
        var spec = ws.WriteSpec("stackloss-count3", Stackloss("stackloss-count3", data, "l1", constraints: Bounds.Replace("MAX", "3", StringComparison.Ordinal)));
        var result = ws.Solve(spec);
        const string caseName = "count max 3 of 3";
        RequireSolved(table, caseName, result, "LP");
        table.Relative(caseName, "objective vs lad.objective", Objective(result), ReferenceData.Number(lad.GetProperty("objective")), objectiveTol, LadFile);
        CompareCoefficients(table, caseName, result, lad.GetProperty("coefficients"), coefTol, LadFile);
        table.WriteTo(_output, "stackloss LAD with a count that restricts nothing:");
        table.AssertAll();
    }

    [GlpsolTheory]
    [InlineData(1)]
    [InlineData(2)]
    public void Glpsol_integer_optimum_of_the_exported_count_milp_equals_the_fit_objective(int max)
    {
        var table = new AgreementTable();
        table.Source(LadFile);
        var caseName = $"count max {max} of 3";
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("published/stackloss.csv");
        var name = $"stackloss-count{max}";
        var spec = ws.WriteSpec(name, Stackloss(name, data, "l1", constraints: Bounds.Replace("MAX", max.ToString(System.Globalization.CultureInfo.InvariantCulture), StringComparison.Ordinal)));
        var result = ws.Solve(spec);
        RequireSolved(table, caseName, result, "MILP");

        var coefficients = result.GetProperty("coefficients");
        var nonZero = Slopes.Count(s => coefficients.GetProperty(s).GetDouble() != 0);
        table.Require(caseName, "slopes non-zero <= max", nonZero <= max, $"{nonZero} slopes non-zero: {coefficients}");
        foreach (var s in Slopes.Where(s => coefficients.GetProperty(s).GetDouble() == 0))
        {
            table.Exact(caseName, s + " left out", coefficients.GetProperty(s).GetDouble(), 0.0, "SPEC.md: coefficients outside the support are exactly zero");
        }

        // Restricting the LAD fit can only raise its optimum (published lad.objective is the unrestricted one).
        var lad = ReferenceData.Number(ReferenceData.Json(LadFile).GetProperty("lad").GetProperty("objective"));
        table.Require(caseName, "objective >= published LAD", Objective(result) >= lad * (1 - 1e-9), $"objective {Objective(result)} below the unrestricted LAD optimum {lad}");

        var mps = Path.Combine(ws.Folder, "mps", name + ".mps");
        var lower = ExternalProcess.Fitspec(ws.Folder, "lower", spec, "--mps", mps);
        Assert.True(lower.ExitCode == 0 && File.Exists(mps), "fitspec lower: " + lower);
        var glpk = Glpsol.SolveFreeMps(mps);
        var report = File.ReadAllText(Path.ChangeExtension(mps, ".glpsol.txt"));
        table.Require(caseName, "glpsol status", report.Contains("INTEGER OPTIMAL", StringComparison.Ordinal), $"glpsol status {glpk.Status}");
        table.Relative(caseName, "glpsol MIP objective vs result.json objective", glpk.Objective, Objective(result), 1e-7, "glpsol on the exported MILP");
        table.WriteTo(_output, $"stackloss LAD, {caseName}: glpsol on `fitspec lower --mps` versus result.json:");
        table.AssertAll();
    }
}
