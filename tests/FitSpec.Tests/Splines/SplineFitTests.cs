using FitSpec.Design;
using FitSpec.Lowering.Constraints;

namespace FitSpec.Tests.Splines;

/// <summary>
/// Spline terms through the whole pipeline: shape constraints on invented noisy data, checked on a dense grid
/// with an independent evaluation of the fitted curve; rank deficiency beside a constant; knot errors.
/// </summary>
public sealed class SplineFitTests : IDisposable
{
    private readonly SplineWorkspace _ws = new();

    public void Dispose() => _ws.Dispose();

    // Invented data: a curve with a dip (so an unconstrained fit is not monotone) plus noise, x on [0, 10].
    private void WriteWigglyData(int seed, Func<double, double> curve)
    {
        var random = new Random(seed);
        var x = Enumerable.Range(0, 80).Select(i => 10.0 * i / 79).ToArray();
        var y = x.Select(v => curve(v) + (0.08 * (random.NextDouble() - 0.5))).ToArray();
        _ws.WriteXy(x, y);
    }

    private static double[] Grid(int count, double from = 0, double to = 10) =>
        Enumerable.Range(0, count).Select(k => from + ((to - from) * k / (count - 1))).ToArray();

    private static double[] Curve(double[] coefficients, int degree, IReadOnlyList<double> breaks, double[] x) =>
        x.Select(v => NaiveBSpline.Curve(breaks, degree, coefficients, Math.Min(v, breaks[^1] - 1e-12))).ToArray();

    [Fact]
    public void An_increasing_spline_fit_does_not_decrease_anywhere()
    {
        WriteWigglyData(11, v => v + (1.5 * Math.Sin(v)));
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                s: {spline: x, knots: 8}
            constraints:
              - {kind: increasing, in: x, over: [0, 10]}
            """);
        Assert.Equal("optimal", result.Status);
        var s = SplineWorkspace.Term(result, "s");
        Assert.Equal(10, s.Length);
        var f = Curve(s, 3, BSplineBasis.UniformBreakpoints(0, 10, 8), Grid(1000));
        for (var k = 1; k < f.Length; k++)
        {
            Assert.True(f[k] - f[k - 1] >= -1e-10, $"decreases between grid points {k - 1} and {k}: {f[k - 1]} → {f[k]}");
        }

        // The constraint binds (the data dip), and the report says how it was enforced.
        var check = Assert.Single(result.Constraints);
        Assert.True(check.Active);
        Assert.StartsWith("through the spline coefficients (sufficient condition)", check.Grid);
        Assert.Contains(result.Lowering, n => n.How.Contains("through the spline coefficients (sufficient condition)", StringComparison.Ordinal));
        Assert.Equal(1001, check.FineGridPoints);
        Assert.True(check.FineGridWorst <= 1e-9);
    }

    [Fact]
    public void A_convex_spline_fit_has_non_negative_second_differences()
    {
        WriteWigglyData(12, v => (0.05 * (v - 4) * (v - 4)) + (0.4 * Math.Sin(2 * v)));
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                s: {spline: x, knots: 9, degree: 3}
            constraints:
              - {kind: convex, in: x, over: [0, 10]}
            """);
        Assert.Equal("optimal", result.Status);
        var f = Curve(SplineWorkspace.Term(result, "s"), 3, BSplineBasis.UniformBreakpoints(0, 10, 9), Grid(1000));
        var scale = f.Max(Math.Abs);
        for (var k = 1; k + 1 < f.Length; k++)
        {
            Assert.True(f[k + 1] - (2 * f[k]) + f[k - 1] >= -1e-12 * scale, $"second difference at grid point {k}: {f[k + 1] - (2 * f[k]) + f[k - 1]}");
        }

        Assert.True(Assert.Single(result.Constraints).Active);
    }

    [Fact]
    public void A_concave_decreasing_spline_with_a_constant_and_a_penalty_holds_both_shapes()
    {
        WriteWigglyData(13, v => 3 - (0.04 * v * v) + (0.3 * Math.Sin(3 * v)));
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                b0: 1
                s: {spline: x, knots: 7}
            penalties:
              - {kind: l2, weight: 1.0e-8, on: [s*]}
            constraints:
              - {kind: decreasing, in: x, over: [0, 10]}
              - {kind: concave, in: x, over: [0, 10]}
            """);
        Assert.Equal("optimal", result.Status);
        var s = SplineWorkspace.Term(result, "s").Select(v => v + SplineWorkspace.Coefficient(result, "b0")).ToArray();
        var f = Curve(s, 3, BSplineBasis.UniformBreakpoints(0, 10, 7), Grid(1000));
        var scale = f.Max(Math.Abs);
        for (var k = 1; k < f.Length; k++)
        {
            Assert.True(f[k] - f[k - 1] <= 1e-12 * scale);
            if (k + 1 < f.Length)
            {
                Assert.True(f[k + 1] - (2 * f[k]) + f[k - 1] <= 1e-12 * scale);
            }
        }
    }

    [Fact]
    public void The_convex_coefficient_condition_is_the_second_derivative_of_the_curve()
    {
        // Rows ≥ 0 must imply f'' ≥ 0 (checked by second differences of the independent evaluation), and the
        // rows' values must be the B-spline coefficients of f'' over the degree d-2 basis on the same
        // breakpoints, whose function k is B_{k+2, d-2} of the degree-d knot vector (two fewer end copies).
        var random = new Random(5);
        foreach (var degree in new[] { 2, 3, 4 })
        {
            var basis = new BSplineBasis([0.0, 0.7, 1.1, 2.5, 2.6, 4.0], degree);
            var rows = SplineShape.Rows(basis, 2, basis.Lower, basis.Upper);
            for (var trial = 0; trial < 200; trial++)
            {
                var c = Enumerable.Range(0, basis.Count).Select(_ => (random.NextDouble() * 4) - 2).ToArray();
                var rowValues = rows.Select(r => r.Select((a, j) => a * c[j]).Sum()).ToArray();
                var x = Enumerable.Range(0, 400).Select(k => 4.0 * k / 400).ToArray();
                var f = x.Select(v => NaiveBSpline.Curve(basis.Breakpoints, degree, c, v)).ToArray();
                var h = x[1] - x[0];
                var second = Enumerable.Range(1, x.Length - 2).Select(k => (f[k + 1] - (2 * f[k]) + f[k - 1]) / (h * h)).ToArray();
                if (rowValues.All(v => v >= 0))
                {
                    Assert.All(second, v => Assert.True(v >= -1e-6, $"degree {degree}: rows ≥ 0 but f'' ≈ {v}"));
                }

                // The rows are the B-spline coefficients of f'' itself: Σ rows_i B_{i,d-2}(x) = f''(x).
                var lower = new BSplineBasis(basis.Breakpoints, degree - 2);
                foreach (var v in new[] { 0.3, 1.0, 1.9, 2.55, 3.7 })
                {
                    var b = lower.All(v);
                    var fromRows = rowValues.Select((r, k) => r * b[k]).Sum();
                    Assert.Equal(basis.All(v, 2).Select((a, j) => a * c[j]).Sum(), fromRows, 1e-9);
                }
            }
        }
    }

    [Fact]
    public void Over_a_sub_range_only_the_coefficients_whose_support_meets_it_are_constrained()
    {
        var cubic = new BSplineBasis(BSplineBasis.UniformBreakpoints(0, 10, 11), 3);
        Assert.Equal(12, SplineShape.Rows(cubic, 1, 0, 10).Count);

        // B'_{i,2} (i = 1..12) is supported on [u_i, u_{i+3}]; [4.5, 5.5] meets those with u_i < 5.5 and u_{i+3} > 4.5.
        var rows = SplineShape.Rows(cubic, 1, 4.5, 5.5);
        var expected = Enumerable.Range(1, 12).Count(i => cubic.Knot(i) < 5.5 && cubic.Knot(i + 3) > 4.5);
        Assert.Equal(expected, rows.Count);
        Assert.Equal(4, rows.Count);
    }

    [Fact]
    public void A_spline_beside_a_constant_is_an_error_naming_both()
    {
        WriteWigglyData(14, v => v);
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                b0: 1
                s: {spline: x, knots: 6}
            """);
        Assert.Equal("error", result.Status);
        Assert.Equal(2, result.ExitCode);
        var error = Assert.Single(result.Errors);
        Assert.Equal("model.terms", error.Field);
        Assert.Equal(7, error.Line);
        Assert.Contains("coefficients 'b0' and 's1'…'s8' are linearly dependent", error.Message, StringComparison.Ordinal);
        Assert.Contains("sums to one", error.Message, StringComparison.Ordinal);
        Assert.Contains(RankCheck.Tolerance.ToString("G2", System.Globalization.CultureInfo.InvariantCulture), error.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("on: [\"*\"]")]
    [InlineData("on: [b0, s*]")]
    [InlineData("on: [s*]")]
    [InlineData("on: [b0]")]
    public void An_l2_penalty_that_reaches_the_dependency_makes_it_solvable(string on)
    {
        // Penalising any part of the combination b0 - Σ s_i = 0 makes the objective strictly convex.
        WriteWigglyData(15, v => Math.Sqrt(v));
        var result = _ws.Run($$"""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                b0: 1
                s: {spline: x, knots: 6}
            penalties:
              - {kind: l2, weight: 1.0e-6, {{on}}}
            """);
        Assert.True(result.Status == "optimal", string.Join("; ", result.Errors.Select(e => e.Message)) + result.StatusDetail);
    }

    [Fact]
    public void A_smoothness_penalty_does_not_remove_the_constant_direction()
    {
        // Differences of s vanish on the all-equal direction, which is exactly the one shared with b0.
        WriteWigglyData(16, v => v);
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                b0: 1
                s: {spline: x, knots: 6}
            penalties:
              - {kind: smoothness, order: 2, weight: 1, on: [s*]}
            """);
        var error = Assert.Single(result.Errors);
        Assert.Contains("'b0' and 's1'…'s8'", error.Message, StringComparison.Ordinal);
        Assert.Contains("penalties given leave this combination unpenalised", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Data_outside_listed_knots_is_an_error_naming_the_data_line()
    {
        WriteWigglyData(17, v => v);
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                s: {spline: x, at: [0, 2.5, 5, 9]}
            """);
        var error = Assert.Single(result.Errors);
        Assert.EndsWith("data.csv", error.File, StringComparison.Ordinal);
        Assert.Equal("x", error.Field);

        // x = 10 i/79 first exceeds 9 at i = 72 (9.11…), data line 74 (the header is line 1).
        Assert.Equal(74, error.Line);
        Assert.Contains("widen the knots", error.Message, StringComparison.Ordinal);
        Assert.Contains("8 rows lie outside", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Knots_with_no_data_under_a_basis_function_are_named()
    {
        WriteWigglyData(18, v => v);
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv, filter: "x <= 4 or x >= 8"}
            model:
              response: y
              terms:
                s: {spline: x, at: [0, 4, 5, 6, 7, 8, 10], degree: 1}
            """);
        Assert.Equal("error", result.Status);
        Assert.Contains(result.Errors, e => e.Message.Contains("'s4'", StringComparison.Ordinal) && e.Message.Contains("zero on every row used", StringComparison.Ordinal));
    }

    [Fact]
    public void Shape_beyond_the_knots_is_refused()
    {
        WriteWigglyData(19, v => v);
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                s: {spline: x, knots: 5}
            constraints:
              - {kind: increasing, in: x, over: [0, 12]}
              - {kind: value, at: {x: -1}, equals: 0}
            """);
        Assert.Equal(2, result.Errors.Count);
        Assert.All(result.Errors, e => Assert.Contains("outside the knots [0, 10] of spline term 's'", e.Message, StringComparison.Ordinal));
    }

    [Fact]
    public void A_spline_sharing_its_input_with_another_term_falls_back_to_the_derivative_grid()
    {
        WriteWigglyData(20, v => v + (1.5 * Math.Sin(v)));
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                slope: x
                s: {spline: x, knots: 6}
            penalties:
              - {kind: l2, weight: 1.0e-6, on: [slope]}
            constraints:
              - {kind: increasing, in: x, over: [0, 10], grid: 41}
            """);
        Assert.True(result.Status == "optimal", string.Join("; ", result.Errors.Select(e => e.Message)) + result.StatusDetail);
        var check = Assert.Single(result.Constraints);
        Assert.StartsWith("derivative >= 0 at 41 equally spaced points", check.Grid);
        Assert.Equal(401, check.FineGridPoints);
    }

    [Fact]
    public void Value_constraints_use_the_spline_basis()
    {
        WriteWigglyData(21, v => v);
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                s: {spline: x, knots: 5, degree: 2}
            constraints:
              - {kind: value, at: {x: 3.3}, equals: 1.25}
            """);
        Assert.Equal("optimal", result.Status);
        var s = SplineWorkspace.Term(result, "s");
        Assert.Equal(1.25, NaiveBSpline.Curve(BSplineBasis.UniformBreakpoints(0, 10, 5), 2, s, 3.3), 1e-8);
    }
}
