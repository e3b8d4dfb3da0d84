using System.Globalization;
using System.Text;
using FitSpec.ReferenceTests.Support;
using Xunit.Abstractions;
using static FitSpec.ReferenceTests.Support.PublishedSpecs;

namespace FitSpec.ReferenceTests;

/// <summary>
/// Published worked examples fitted with LP losses (l1, quantile, linf) through the whole pipeline
/// (spec file → result.json), checked to each reference file's tolerance_hint. Reference values, tolerances
/// and sources are read from the reference folder's JSON files (published/README.md describes them).
/// </summary>
public sealed class PublishedLinearProgramTests
{
    private readonly ITestOutputHelper _output;

    public PublishedLinearProgramTests(ITestOutputHelper output) => _output = output;

    /// <summary>
    /// stackloss.lad.json: LAD (the "lad" entry, objective Σ|e|) and the tau = 0.25 / 0.75 quantile regressions
    /// (the "quantiles" entries, objective Σ check loss) of stack_loss on intercept + air_flow + water_temp + acid_conc.
    /// </summary>
    [ReferenceFact]
    public void Stackloss_lad_and_quantile_regressions_match_the_published_vertex()
    {
        const string file = "published/stackloss.lad.json";
        var table = new AgreementTable();
        table.Source(file);
        var reference = ReferenceData.Json(file);
        var objectiveTol = AgreementTable.HintTolerance(reference, "objective", "relative");
        var coefTol = AgreementTable.HintTolerance(reference, "coefficients", "max(1, |b_ref|)");

        var cases = new List<(string Case, string Loss, System.Text.Json.JsonElement Entry)>
        {
            ("stackloss lad", "l1", reference.GetProperty("lad")),
        };
        foreach (var q in reference.GetProperty("quantiles").EnumerateObject())
        {
            cases.Add(($"stackloss tau {q.Name}", QuantileLoss(q.Value.GetProperty("tau").GetString()!), q.Value));
        }

        Assert.Equal(3, cases.Count);
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("published/stackloss.csv");
        foreach (var (caseName, loss, entry) in cases)
        {
            var result = ws.Solve(ws.WriteSpec(Slug(caseName), Stackloss(Slug(caseName), data, loss)));
            RequireSolved(table, caseName, result, "LP");
            table.Relative(caseName, "objective", Objective(result), ReferenceData.Number(entry.GetProperty("objective")), objectiveTol, file);
            CompareCoefficients(table, caseName, result, entry.GetProperty("coefficients"), coefTol, file);
        }

        table.WriteTo(_output, "stackloss LAD and quantile regressions (objective: Σ|e| for l1, Σ check loss for quantile):");
        table.AssertAll();
    }

    /// <summary>engel.quantiles.json: foodexp ~ 1 + income for tau in {0.1, 0.25, 0.5, 0.75, 0.9}.</summary>
    [ReferenceFact]
    public void Engel_quantile_regressions_match_the_published_vertex()
    {
        const string file = "published/engel.quantiles.json";
        var table = new AgreementTable();
        table.Source(file);
        var reference = ReferenceData.Json(file);
        var objectiveTol = AgreementTable.HintTolerance(reference, "objective", "relative");

        // The hint's coefficient tolerance is the one for vertex (simplex-type) solvers; HiGHS solves LPs by simplex here.
        var coefTol = AgreementTable.HintTolerance(reference, "coefficients", "vertex");
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("published/engel.csv");
        var count = 0;
        foreach (var q in reference.GetProperty("quantiles").EnumerateObject())
        {
            count++;
            var caseName = $"engel tau {q.Name}";
            var result = ws.Solve(ws.WriteSpec(Slug(caseName), Engel(Slug(caseName), data, QuantileLoss(q.Value.GetProperty("tau").GetString()!))));
            RequireSolved(table, caseName, result, "LP");
            table.Relative(caseName, "objective", Objective(result), ReferenceData.Number(q.Value.GetProperty("objective")), objectiveTol, file);
            CompareCoefficients(table, caseName, result, q.Value.GetProperty("coefficients"), coefTol, file);
        }

        Assert.Equal(5, count);
        table.WriteTo(_output, "Engel quantile regressions (objective: Σ check loss):");
        table.AssertAll();
    }

    /// <summary>stackloss.chebyshev.json: minimax (L-infinity) regression; objective max|e|.</summary>
    [ReferenceFact]
    public void Stackloss_chebyshev_regression_matches_the_published_vertex()
    {
        const string file = "published/stackloss.chebyshev.json";
        var table = new AgreementTable();
        table.Source(file);
        var reference = ReferenceData.Json(file);
        var objectiveTol = AgreementTable.HintTolerance(reference, "objective", "relative");
        var coefTol = AgreementTable.HintTolerance(reference, "coefficients", "max(1, |b_ref|)");
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("published/stackloss.csv");
        const string caseName = "stackloss linf";
        var result = ws.Solve(ws.WriteSpec("stackloss-linf", Stackloss("stackloss-linf", data, "linf")));
        RequireSolved(table, caseName, result, "LP");
        var refObjective = ReferenceData.Number(reference.GetProperty("objective"));
        table.Relative(caseName, "objective", Objective(result), refObjective, objectiveTol, file);

        // The objective must be the max |e| of the returned fit, which the metrics report independently.
        table.Relative(caseName, "metrics.max_abs_residual", result.GetProperty("metrics").GetProperty("max_abs_residual").GetDouble(), refObjective, objectiveTol, file);
        CompareCoefficients(table, caseName, result, reference.GetProperty("coefficients"), coefTol, file);
        table.WriteTo(_output, "stackloss Chebyshev regression (objective: max|e|):");
        table.AssertAll();
    }

    /// <summary>
    /// minimax-exp.json: the best uniform line a + m x for exp(x) on [0, 1], as a discrete linf fit on
    /// {k/1000 : k = 0..1000} plus the contact point c; a, m and t (the objective) within the hint's absolute
    /// tolerance of the closed form.
    /// </summary>
    [ReferenceFact]
    public void Minimax_line_for_exp_matches_the_equioscillation_closed_form()
    {
        const string file = "published/minimax-exp.json";
        var table = new AgreementTable();
        table.Source(file);
        var reference = ReferenceData.Json(file);
        var tol = AgreementTable.HintTolerance(reference, "discrete_lp_with_c_in_grid", "absolute");
        var c = ReferenceData.Number(reference.GetProperty("contact_point_c"));
        var grid = Enumerable.Range(0, 1001).Select(k => k / 1000.0).Append(c).Order().ToList();
        Assert.Equal(1002, grid.Distinct().Count());

        using var ws = new SpecWorkspace();
        var csv = new StringBuilder("x,y\n");
        foreach (var x in grid)
        {
            csv.Append(CultureInfo.InvariantCulture, $"{x:R},{Math.Exp(x):R}\n");
        }

        File.WriteAllText(Path.Combine(ws.Folder, "exp-grid.csv"), csv.ToString());
        var spec = ws.WriteSpec("minimax-exp", """
            fitspec: 1
            name: minimax-exp
            data:
              path: exp-grid.csv
            model:
              response: y
              terms:
                a: 1
                m: x
            loss: linf
            report:
              formats: [json]
            """);
        var result = ws.Solve(spec);
        const string caseName = "exp on [0,1]";
        RequireSolved(table, caseName, result, "LP");
        var coefficients = result.GetProperty("coefficients");
        table.Absolute(caseName, "a", coefficients.GetProperty("a").GetDouble(), ReferenceData.Number(reference.GetProperty("intercept_a")), tol, file);
        table.Absolute(caseName, "m", coefficients.GetProperty("m").GetDouble(), ReferenceData.Number(reference.GetProperty("slope_m")), tol, file);
        table.Absolute(caseName, "t (objective)", Objective(result), ReferenceData.Number(reference.GetProperty("max_error_E")), tol, file);
        table.WriteTo(_output, "Best uniform line for exp on [0, 1], discrete linf fit on 1002 points (closed form: Chebyshev equioscillation):");
        table.AssertAll();
    }

    private static string Slug(string caseName) => caseName.Replace(' ', '-').Replace('.', 'p');
}
