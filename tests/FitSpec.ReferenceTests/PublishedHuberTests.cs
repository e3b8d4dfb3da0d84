using FitSpec.ReferenceTests.Support;
using Xunit.Abstractions;
using static FitSpec.ReferenceTests.Support.PublishedSpecs;

namespace FitSpec.ReferenceTests;

/// <summary>
/// huber.json: Huber regression of stack_loss on intercept + air_flow + water_temp + acid_conc with the fixed
/// threshold M of its loss_convention. The file's convention, phi(e) = e² for |e| ≤ M and 2M|e| − M² beyond,
/// is the spec language's, so the objective Σ phi(e_i) compares directly.
/// </summary>
public sealed class PublishedHuberTests
{
    private readonly ITestOutputHelper _output;

    public PublishedHuberTests(ITestOutputHelper output) => _output = output;

    [ReferenceFact]
    public void Stackloss_huber_regression_matches_the_published_solution()
    {
        const string file = "published/huber.json";
        var table = new AgreementTable();
        table.Source(file);
        var reference = ReferenceData.Json(file);
        var convention = reference.GetProperty("loss_convention");
        Assert.Contains("2*M*|r| - M^2", convention.GetProperty("phi(r)").GetString()!, StringComparison.Ordinal);
        var width = convention.GetProperty("M").GetString()!;
        var objectiveTol = AgreementTable.HintTolerance(reference, "objective", "relative");
        var coefTol = AgreementTable.HintTolerance(reference, "coefficients", "max(1, |b_ref|)");
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("published/stackloss.csv");
        var spec = ws.WriteSpec("stackloss-huber", Stackloss("stackloss-huber", data, $"{{kind: huber, width: {width}}}"));
        var result = ws.Solve(spec);
        var caseName = $"stackloss huber M={width}";
        RequireSolved(table, caseName, result, "QP");
        table.Relative(caseName, "objective", Objective(result), ReferenceData.Number(reference.GetProperty("objective")), objectiveTol, file);
        CompareCoefficients(table, caseName, result, reference.GetProperty("coefficients"), coefTol, file);
        table.WriteTo(_output, "stackloss Huber regression (objective: Σ phi(e), phi = e² inside M, 2M|e| − M² outside):");
        table.AssertAll();
    }
}
