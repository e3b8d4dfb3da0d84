using FitSpec.ReferenceTests.Support;
using Xunit.Abstractions;
using static FitSpec.ReferenceTests.Support.PublishedSpecs;

namespace FitSpec.ReferenceTests;

/// <summary>
/// Independent solver cross-check: `fitspec lower SPEC --mps FILE` exports the program FitSpec solves;
/// GLPK's glpsol (GLPSOL--GLPK LP/MIP Solver, Debian glpk-utils) solves that file on its own, and its optimum
/// must equal the result.json objective (for these LPs the exported program's objective is the fit's objective)
/// and the published optimum of the reference file.
/// </summary>
public sealed class GlpsolCrossCheckTests
{
    private const double Tolerance = 1e-7;

    private readonly ITestOutputHelper _output;

    public GlpsolCrossCheckTests(ITestOutputHelper output) => _output = output;

    [GlpsolTheory]
    [InlineData("stackloss-lad")]
    [InlineData("stackloss-tau-0.25")]
    [InlineData("stackloss-linf")]
    [InlineData("engel-tau-0.5")]
    [InlineData("engel-tau-0.9")]
    public void Glpsol_optimum_of_the_exported_program_equals_the_fit_objective(string caseName)
    {
        var (referenceFile, dataFile, referenceObjective, specFor) = Case(caseName);
        var table = new AgreementTable();
        table.Source(referenceFile);
        using var ws = new SpecWorkspace();
        var data = ws.CopyData(dataFile);
        var spec = ws.WriteSpec(caseName, specFor(data));
        var result = ws.Solve(spec);
        RequireSolved(table, caseName, result, "LP");

        var mps = Path.Combine(ws.Folder, "mps", caseName + ".mps");
        var lower = ExternalProcess.Fitspec(ws.Folder, "lower", spec, "--mps", mps);
        Assert.True(lower.ExitCode == 0 && File.Exists(mps), "fitspec lower: " + lower);
        var glpk = Glpsol.SolveFreeMps(mps);
        table.Require(caseName, "glpsol status", glpk.Status == "OPTIMAL" && glpk.PrimalDualStatus == "f/f", $"glpsol status {glpk.Status}, primal/dual {glpk.PrimalDualStatus}");
        table.Relative(caseName, "glpsol objective vs result.json objective", glpk.Objective, Objective(result), Tolerance, "glpsol on the exported program");
        table.Relative(caseName, "glpsol objective vs published objective", glpk.Objective, referenceObjective, Tolerance, referenceFile);
        table.Relative(caseName, "glpsol printed objective (10 digits) vs result.json", glpk.PrintedObjective, Objective(result), Tolerance, "glpsol -o report");
        table.WriteTo(_output, $"{caseName}: glpsol on `fitspec lower --mps` versus result.json:");
        table.AssertAll();
    }

    private static (string ReferenceFile, string DataFile, double Objective, Func<string, string> Spec) Case(string caseName)
    {
        const string stackloss = "published/stackloss.lad.json";
        const string chebyshev = "published/stackloss.chebyshev.json";
        const string engel = "published/engel.quantiles.json";
        switch (caseName)
        {
            case "stackloss-lad":
                return (stackloss, "published/stackloss.csv", ReferenceData.Number(ReferenceData.Json(stackloss).GetProperty("lad").GetProperty("objective")),
                    data => Stackloss(caseName, data, "l1"));
            case "stackloss-linf":
                return (chebyshev, "published/stackloss.csv", ReferenceData.Number(ReferenceData.Json(chebyshev).GetProperty("objective")),
                    data => Stackloss(caseName, data, "linf"));
            case "stackloss-tau-0.25":
                {
                    var entry = ReferenceData.Json(stackloss).GetProperty("quantiles").GetProperty("0.25");
                    return (stackloss, "published/stackloss.csv", ReferenceData.Number(entry.GetProperty("objective")),
                        data => Stackloss(caseName, data, QuantileLoss(entry.GetProperty("tau").GetString()!)));
                }

            case "engel-tau-0.5" or "engel-tau-0.9":
                {
                    var entry = ReferenceData.Json(engel).GetProperty("quantiles").GetProperty(caseName["engel-tau-".Length..]);
                    return (engel, "published/engel.csv", ReferenceData.Number(entry.GetProperty("objective")),
                        data => Engel(caseName, data, QuantileLoss(entry.GetProperty("tau").GetString()!)));
                }

            default:
                throw new ArgumentOutOfRangeException(nameof(caseName), caseName, "unknown case");
        }
    }
}
