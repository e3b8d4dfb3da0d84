using FitSpec.Results;
using static FitSpec.Tests.Penalties.TestMath;

namespace FitSpec.Tests.Penalties;

/// <summary>
/// The count penalty against brute force written here: every support of at most K coefficients is solved as
/// its own fit through the public pipeline — the spec without the count, with {kind: bounds, min: 0, max: 0}
/// on the coefficients left out — and the best kept. The count fit must reach that optimum, return exact
/// zeros outside its support, and report the duals of the solve on the chosen support.
/// </summary>
public sealed class CountPenaltyTests
{
    private const int Rows = 30;
    private const int Candidates = 6;

    // Relative agreement of two optima of the same LP/QP solved along different paths (both HiGHS, tolerances 1e-9).
    private const double ObjectiveTolerance = 1e-7;

    // Coefficient agreement |b - b_ref| / max(1, |b_ref|): coefficients are unique for this data (n = 30 ≫ 3 free
    // coefficients in general position), so two optimal solves agree to about the solver tolerance.
    private const double CoefficientTolerance = 1e-6;

    private static readonly string[] Names = Enumerable.Range(1, Candidates).Select(i => $"x{i}").ToArray();

    /// <summary>
    /// y = 2 + 1.5 x2 − 0.8 x5 + noise, two gross outliers; x1..x6 uniform on [-1, 1]. Generated with a fixed seed
    /// (test input only; every check value below is computed from it by the brute force).
    /// </summary>
    private static string WriteData(PenaltyWorkspace ws, bool duplicateFirst = false)
    {
        var random = new Random(20240611);
        var rows = new List<double[]>();
        for (var i = 0; i < Rows; i++)
        {
            var x = Enumerable.Range(0, Candidates).Select(_ => (2 * random.NextDouble()) - 1).ToArray();
            if (duplicateFirst)
            {
                x[1] = x[0];
            }

            var noise = 0.1 * ((random.NextDouble() + random.NextDouble() + random.NextDouble()) - 1.5);
            var y = 2 + (1.5 * x[1]) - (0.8 * x[4]) + noise + (i is 4 or 17 ? 3.0 : 0.0);
            rows.Add([.. x, y]);
        }

        return ws.WriteCsv("data.csv", [.. Names, "y"], rows);
    }

    private static string Spec(string data, string loss, string penalties, string constraints) => $$"""
        fitspec: 1
        name: count-test
        data:
          path: {{data}}
        model:
          response: y
          terms:
            c0: 1
            x: {columns: "x*"}
        loss: {{loss}}
        {{penalties}}
        constraints:
        {{constraints}}
        report:
          formats: [json]
        """;

    private sealed record BruteForce(int[] Support, FitResult Result);

    /// <summary>Each support as its own fit (left-out coefficients bounded to 0); the feasible one with the least objective.</summary>
    private static BruteForce Best(PenaltyWorkspace ws, string data, string loss, string constraints, int max, int? required = null)
    {
        BruteForce? best = null;
        foreach (var support in Subsets(Candidates, max))
        {
            // A support without a coefficient whose bounds exclude 0 contradicts those bounds: no fit to run.
            if (required is { } r && !support.Contains(r))
            {
                continue;
            }

            var excluded = Enumerable.Range(0, Candidates).Where(i => !support.Contains(i)).Select(i => Names[i]).ToList();
            var fix = excluded.Count == 0 ? string.Empty : $"\n  - {{kind: bounds, on: [{string.Join(", ", excluded)}], min: 0, max: 0}}";
            var result = ws.Run(Spec(data, loss, string.Empty, constraints + fix));
            if (result.Status == "infeasible")
            {
                continue;
            }

            Assert.True(result.Status == "optimal", $"brute force support {{{string.Join(",", support)}}}: {result.Status} {result.StatusDetail}");
            if (best is null || result.Objective!.Value < best.Result.Objective!.Value)
            {
                best = new BruteForce(support, result);
            }
        }

        return best ?? throw new InvalidOperationException("no support is feasible");
    }

    private static void AssertMatches(BruteForce expected, FitResult actual, int max)
    {
        Assert.Equal("optimal", actual.Status);
        Assert.True(actual.Verification!.Passed, string.Join("; ", actual.Verification.Failures));
        var reference = expected.Result.Objective!.Value;
        Assert.True(Math.Abs(actual.Objective!.Value - reference) <= ObjectiveTolerance * Math.Max(1, Math.Abs(reference)), $"objective {actual.Objective} vs brute force {reference}");
        foreach (var c in expected.Result.Coefficients)
        {
            var got = Coefficient(actual, c.Name);
            Assert.True(Math.Abs(got - c.Value) <= CoefficientTolerance * Math.Max(1, Math.Abs(c.Value)), $"{c.Name}: {got} vs brute force {c.Value}");
        }

        // Outside the brute force's support the count fit's coefficients are exactly zero, not merely small.
        for (var i = 0; i < Candidates; i++)
        {
            if (!expected.Support.Contains(i))
            {
                Assert.Equal(0.0, Coefficient(actual, Names[i]));
            }
        }

        Assert.True(Names.Count(n => Coefficient(actual, n) != 0) <= max);
    }

    [Fact]
    public void L1_count_is_a_milp_and_equals_brute_force_over_every_support()
    {
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        const string constraints = "  - {kind: bounds, on: [\"x*\"], min: -5, max: 5}";
        var expected = Best(ws, data, "l1", constraints, 2);
        var actual = ws.Run(Spec(data, "l1", "penalties:\n  - {kind: count, max: 2, on: [\"x*\"]}", constraints));
        Assert.Equal("MILP", actual.Problem!.Class);
        AssertMatches(expected, actual, 2);
        Assert.Contains(actual.Lowering, n => n.How.Contains("MILP: 6 binaries, big-M from bounds; polished on the chosen support", StringComparison.Ordinal));
    }

    [Fact]
    public void L2_count_is_enumerated_and_equals_brute_force_over_every_support()
    {
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        const string constraints = "  - {kind: bounds, on: [\"x*\"], min: -5, max: 5}";
        var expected = Best(ws, data, "l2", constraints, 2);
        var actual = ws.Run(Spec(data, "l2", "penalties:\n  - {kind: count, max: 2, on: [\"x*\"]}", constraints));
        Assert.Equal("QP", actual.Problem!.Class);
        AssertMatches(expected, actual, 2);

        // 1 + 6 + 15 subsets of at most 2 of 6.
        Assert.Contains(actual.Lowering, n => n.How.Contains("exact by enumeration of 22 supports", StringComparison.Ordinal));
        Assert.Contains(actual.Lowering, n => n.How.Contains("enumerated 22 supports (QPs)", StringComparison.Ordinal));
    }

    [Fact]
    public void L2_count_equals_least_squares_on_the_best_support_by_the_normal_equations()
    {
        // Independent of HiGHS: each support's unconstrained least squares by the normal equations (written in
        // the test); the bounds ±100 are far from every such fit, so they are inactive.
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        var table = File.ReadAllLines(Path.Combine(ws.Folder, data)).Skip(1)
            .Select(l => l.Split(',').Select(v => double.Parse(v, System.Globalization.CultureInfo.InvariantCulture)).ToArray()).ToArray();
        var y = table.Select(r => r[Candidates]).ToArray();
        var ones = Enumerable.Repeat(1.0, Rows).ToArray();
        (double Sse, int[] Support, double[] Beta)? best = null;
        foreach (var support in Subsets(Candidates, 3))
        {
            var columns = new List<double[]> { ones };
            columns.AddRange(support.Select(j => table.Select(r => r[j]).ToArray()));
            var beta = LeastSquares(columns, y);
            var sse = y.Select((v, i) => v - columns.Select((c, k) => c[i] * beta[k]).Sum()).Sum(e => e * e);
            if (best is null || sse < best.Value.Sse)
            {
                best = (sse, support, beta);
            }
        }

        var actual = ws.Run(Spec(data, "l2", "penalties:\n  - {kind: count, max: 3}", "  - {kind: bounds, on: [\"x*\"], min: -100, max: 100}"));
        Assert.Equal("optimal", actual.Status);
        var (refSse, refSupport, refBeta) = best!.Value;
        Assert.True(Math.Abs(actual.Objective!.Value - refSse) <= 1e-8 * refSse, $"objective {actual.Objective} vs normal equations {refSse}");
        Assert.True(Math.Abs(Coefficient(actual, "c0") - refBeta[0]) <= 1e-7, "c0");
        for (var k = 0; k < refSupport.Length; k++)
        {
            Assert.True(Math.Abs(Coefficient(actual, Names[refSupport[k]]) - refBeta[k + 1]) <= 1e-7, Names[refSupport[k]]);
        }

        foreach (var j in Enumerable.Range(0, Candidates).Except(refSupport))
        {
            Assert.Equal(0.0, Coefficient(actual, Names[j]));
        }
    }

    [Theory]
    [InlineData("l1")]
    [InlineData("l2")]
    public void Duals_are_those_of_the_solve_on_the_chosen_support(string loss)
    {
        // x2's own fit wants about 1.5; capping it at 1.2 makes the relation active with a positive price. The
        // brute force's fit of the winning support prices the same relation in the same LP/QP.
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        const string constraints = "  - {kind: bounds, on: [\"x*\"], min: -5, max: 5}\n  - \"x2 <= 1.2\"";
        var expected = Best(ws, data, loss, constraints, 2);
        var actual = ws.Run(Spec(data, loss, "penalties:\n  - {kind: count, max: 2, on: [\"x*\"]}", constraints));
        AssertMatches(expected, actual, 2);
        var cap = actual.Constraints.Single(c => c.Label == "x2 <= 1.2");
        var reference = expected.Result.Constraints.Single(c => c.Label == "x2 <= 1.2");
        Assert.True(cap.Active);
        Assert.NotNull(cap.Dual);
        Assert.True(reference.Dual > 0, $"the brute force's price of the cap is {reference.Dual}");
        Assert.True(Math.Abs(cap.Dual!.Value - reference.Dual!.Value) <= 1e-6 * Math.Max(1, reference.Dual.Value), $"dual {cap.Dual} vs brute force {reference.Dual}");
        Assert.NotNull(actual.Constraints.Single(c => c.Label != "x2 <= 1.2").Dual);
    }

    [Fact]
    public void A_coefficient_whose_bounds_exclude_zero_is_always_in_the_support()
    {
        // x4 has no effect in the data, but 0.5 <= x4 forces it non-zero, so every support without x4 is
        // infeasible and the brute force tries only those with it.
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        const string constraints = "  - {kind: bounds, on: [\"x*\"], min: -5, max: 5}\n  - \"x4 >= 0.5\"";
        foreach (var loss in new[] { "l1", "l2" })
        {
            var expected = Best(ws, data, loss, constraints, 2, required: 3);
            var actual = ws.Run(Spec(data, loss, "penalties:\n  - {kind: count, max: 2, on: [\"x*\"]}", constraints));
            AssertMatches(expected, actual, 2);
            Assert.Contains(actual.Lowering, n => n.How.Contains("x4: bounds exclude 0", StringComparison.Ordinal));
        }
    }

    [Fact]
    public void Enumeration_breaks_ties_by_support_order()
    {
        // Every row (a, b, y) comes with its mirror (b, a, y), so the fits on {x1} and on {x2} see the same
        // (x, y) pairs and tie exactly; the earlier support ({x1}) must win, on every run and whatever the thread
        // count. (x1 and x2 are not collinear, so the design itself is well posed.)
        using var ws = new PenaltyWorkspace();
        var random = new Random(99);
        var rows = new List<double[]>();
        for (var i = 0; i < 15; i++)
        {
            var a = (2 * random.NextDouble()) - 1;
            var b = (2 * random.NextDouble()) - 1;
            var y = 1 + a + b + (0.2 * (random.NextDouble() - 0.5));
            rows.Add([a, b, y]);
            rows.Add([b, a, y]);
        }

        var data = ws.WriteCsv("mirror.csv", ["x1", "x2", "y"], rows);
        var spec = Spec(data, "l2", "penalties:\n  - {kind: count, max: 1}", "  - {kind: bounds, on: [x1, x2], min: -5, max: 5}");
        for (var run = 0; run < 3; run++)
        {
            var actual = ws.Run(spec);
            Assert.True(actual.Status == "optimal", actual.StatusDetail + string.Join("; ", actual.Errors.Select(e => e.Message)));
            Assert.NotEqual(0.0, Coefficient(actual, "x1"));
            Assert.Equal(0.0, Coefficient(actual, "x2"));
        }
    }

    [Fact]
    public void Missing_bounds_are_an_error_naming_the_coefficients()
    {
        using var ws = new PenaltyWorkspace();
        var data = WriteData(ws);
        // x1: a bounds item; x4: two one-sided relations; x2: only a lower side; x3, x5, x6: nothing.
        const string constraints = "  - {kind: bounds, on: [x1], min: -5, max: 5}\n  - \"x2 >= -3\"\n  - \"x4 >= -1\"\n  - \"2*x4 <= 3\"";
        var result = ws.Run(Spec(data, "l1", "penalties:\n  - {kind: count, max: 2, on: [\"x*\"]}", constraints));
        Assert.Equal("error", result.Status);
        var error = Assert.Single(result.Errors);
        Assert.Contains("x2 (no upper bound), x3 (no bounds), x5 (no bounds), x6 (no bounds)", error.Message, StringComparison.Ordinal);
        Assert.Contains("add {kind: bounds, on: [x2, x3, x5, x6], min: ..., max: ...}", error.Message, StringComparison.Ordinal);
        Assert.DoesNotContain("x1", error.Message, StringComparison.Ordinal);
        Assert.DoesNotContain("x4", error.Message, StringComparison.Ordinal);
        Assert.Equal("penalties.on", error.Field);
        Assert.NotNull(error.Line);
    }

    [Fact]
    public void Too_many_supports_for_a_quadratic_objective_is_refused_with_the_count()
    {
        using var ws = new PenaltyWorkspace();
        var random = new Random(7);
        var header = Enumerable.Range(1, 30).Select(i => $"x{i}").Append("y").ToList();
        var data = ws.WriteCsv("wide.csv", header, Enumerable.Range(0, 40).Select(_ => Enumerable.Range(0, 31).Select(_ => random.NextDouble()).ToArray()));
        var spec = Spec(data, "l2", "penalties:\n  - {kind: count, max: 5, on: [\"x*\"]}", "  - {kind: bounds, on: [\"x*\"], min: -5, max: 5}");
        var result = ws.Run(spec);
        Assert.Equal("error", result.Status);
        var error = Assert.Single(result.Errors);
        // Σ_{s=0}^{5} C(30, s) = 1 + 30 + 435 + 4060 + 27405 + 142506 = 174437.
        Assert.Contains("174,437 supports", error.Message, StringComparison.Ordinal);
        Assert.Contains("lower max, list fewer coefficients in on:, or use an l1 loss", error.Message, StringComparison.Ordinal);
        Assert.Equal("penalties.max", error.Field);

        // The same count with an l1 loss is accepted and lowered as a MILP (not solved here: branch and cut on 30
        // binaries over structureless data takes tens of seconds).
        var l1 = Path.Combine(ws.Folder, "wide-l1.fit.yaml");
        File.WriteAllText(l1, spec.Replace("loss: l2", "loss: l1", StringComparison.Ordinal));
        var lowered = FitSpec.Pipeline.FitRunner.Lower(FitSpec.Spec.SpecReader.Read(l1).Document!, forceProgram: false);
        Assert.Equal(FitSpec.Lowering.ProblemClass.MILP, lowered.Class);
        Assert.Equal(30, lowered.Program.Integer.Count(b => b));
    }
}
