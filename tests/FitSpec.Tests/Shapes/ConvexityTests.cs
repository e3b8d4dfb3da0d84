using FitSpec.Tests.Splines;

namespace FitSpec.Tests.Shapes;

/// <summary>
/// convex/concave on polynomial terms: the second derivative, written out in the test from the reported raw
/// coefficients (f'' = 2 p2 + 6 p3 x + 12 p4 x²), holds its sign at the grid, and the fine-grid worst
/// violation in the report is the one found by evaluating f'' on ten times the points.
/// </summary>
public sealed class ConvexityTests : IDisposable
{
    private readonly SplineWorkspace _ws = new();

    public void Dispose() => _ws.Dispose();

    private void WriteData(int seed, Func<double, double> curve)
    {
        var random = new Random(seed);
        var x = Enumerable.Range(0, 60).Select(i => 10.0 * i / 59).ToArray();
        _ws.WriteXy(x, x.Select(v => curve(v) + (0.05 * (random.NextDouble() - 0.5))).ToArray());
    }

    private static double Second(double[] p, double x)
    {
        // p[k-1] multiplies x^k; f'' = Σ k (k-1) p_k x^(k-2).
        double s = 0;
        for (var k = 2; k <= p.Length; k++)
        {
            s += k * (k - 1) * p[k - 1] * Math.Pow(x, k - 2);
        }

        return s;
    }

    [Theory]
    [InlineData("convex", 1.0)]
    [InlineData("concave", -1.0)]
    public void A_cubic_holds_its_curvature_sign_on_the_whole_range(string kind, double sign)
    {
        // Invented data curving the other way (and a wiggle), so the constraint must bind.
        WriteData(31, v => (-sign * 0.03 * (v - 5) * (v - 5)) + (0.2 * Math.Sin(v)));
        var result = _ws.Run($$"""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                b0: 1
                p: {polynomial: x, degree: 3}
            constraints:
              - {kind: {{kind}}, in: x, over: [0, 10]}
            """);
        Assert.True(result.Status == "optimal", string.Join("; ", result.Errors.Select(e => e.Message)) + result.StatusDetail);
        var p = SplineWorkspace.Term(result, "p");
        Assert.Equal(3, p.Length);
        var scale = 1 + Math.Abs(p[1]) + Math.Abs(6 * p[2] * 10);

        // f'' is linear: its sign at both ends is its sign everywhere; the grid includes both ends.
        foreach (var x in new[] { 0.0, 10.0 })
        {
            Assert.True(sign * Second(p, x) >= -1e-7 * scale, $"{kind}: f''({x}) = {Second(p, x)}");
        }

        var check = Assert.Single(result.Constraints);
        Assert.Equal(kind, check.Kind);
        Assert.True(check.Active);
        Assert.StartsWith($"second derivative {(sign > 0 ? ">=" : "<=")} 0 at 101 equally spaced points of [0, 10]", check.Grid);
        Assert.Equal(1001, check.FineGridPoints);
        Assert.True(check.FineGridWorst <= 1e-7 * scale);
    }

    [Fact]
    public void Between_coarse_grid_points_a_quartic_may_bend_and_the_fine_grid_reports_how_much()
    {
        // With three grid points, f'' (a quadratic) is only held at 0, 5 and 10; data that want a concave
        // bump in between make it dip there. The report's worst violation must be the dip on 21 points.
        WriteData(32, v => -0.2 * Math.Pow(v - 7.5, 2) + (0.02 * v * v * v));
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                b0: 1
                p: {polynomial: x, degree: 4}
            constraints:
              - {kind: convex, in: x, over: [0, 10], grid: 3}
            """);
        Assert.True(result.Status == "optimal", string.Join("; ", result.Errors.Select(e => e.Message)) + result.StatusDetail);
        var p = SplineWorkspace.Term(result, "p");
        var check = Assert.Single(result.Constraints);
        Assert.Equal(21, check.FineGridPoints);
        var expected = Enumerable.Range(0, 21).Select(k => Math.Max(0, -Second(p, 10.0 * k / 20))).Max();
        Assert.True(expected > 1e-6, $"the data were meant to make f'' dip between grid points; worst {expected}");
        Assert.Equal(expected, check.FineGridWorst!.Value, 1e-9 * (1 + expected));

        // At the three grid points themselves the constraint holds.
        foreach (var x in new[] { 0.0, 5.0, 10.0 })
        {
            Assert.True(Second(p, x) >= -1e-7 * (1 + Math.Abs(p[3]) * 1200), $"f''({x}) = {Second(p, x)}");
        }
    }

    [Fact]
    public void Convexity_in_one_input_of_two_is_held_at_the_given_value_of_the_other()
    {
        var random = new Random(33);
        var lines = new List<string> { "x,z,y" };
        for (var i = 0; i < 80; i++)
        {
            var x = 10.0 * (i % 20) / 19;
            var z = i / 20;
            var y = (-0.02 * (x - 5) * (x - 5)) + (0.5 * z) + (0.05 * (random.NextDouble() - 0.5));
            lines.Add(FormattableString.Invariant($"{x:R},{z},{y:R}"));
        }

        File.WriteAllLines(Path.Combine(_ws.Folder, "data.csv"), lines);
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                b0: 1
                p: {polynomial: x, degree: 2}
                c: x*z
                d: x^2*z
            constraints:
              - {kind: convex, in: x, over: [0, 10], at: {z: 2}}
            """);
        Assert.True(result.Status == "optimal", string.Join("; ", result.Errors.Select(e => e.Message)) + result.StatusDetail);

        // f'' in x at z = 2: 2 p2 + 2 d z.
        var second = (2 * SplineWorkspace.Coefficient(result, "p2")) + (2 * SplineWorkspace.Coefficient(result, "d") * 2);
        Assert.True(second >= -1e-8);
        Assert.True(Assert.Single(result.Constraints).Active);
    }

    [Fact]
    public void A_degree_zero_spline_cannot_be_made_convex()
    {
        WriteData(34, v => v);
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                s: {spline: x, knots: 5, degree: 0}
            constraints:
              - {kind: convex, in: x, over: [0, 10]}
            """);
        var error = Assert.Single(result.Errors);
        Assert.Contains("degree 0", error.Message, StringComparison.Ordinal);
        Assert.Equal(8, error.Line);
    }

    [Fact]
    public void An_increasing_step_spline_has_no_downward_steps()
    {
        // Degree 0: the curve is piecewise constant; enforced exactly on its jumps at the knots.
        WriteData(35, v => Math.Sin(v));
        var result = _ws.Run("""
            fitspec: 1
            data: {path: data.csv}
            model:
              response: y
              terms:
                s: {spline: x, knots: 6, degree: 0}
            constraints:
              - {kind: increasing, in: x, over: [0, 10]}
            """);
        Assert.Equal("optimal", result.Status);
        var s = SplineWorkspace.Term(result, "s");
        Assert.Equal(5, s.Length);
        for (var i = 1; i < s.Length; i++)
        {
            Assert.True(s[i] >= s[i - 1] - 1e-9, $"step {i}: {s[i - 1]} → {s[i]}");
        }

        Assert.StartsWith("through the spline coefficients (exact)", Assert.Single(result.Constraints).Grid);
    }
}
