using static FitSpec.Tests.Sequential.SequentialFits;

namespace FitSpec.Tests.Sequential;

/// <summary>The lp loss Σ w |e|^p, solved as a sequence of QPs.</summary>
public sealed class LpLossTests
{
    private const string LineModel = "model:\n  response: y\n  terms:\n    b0: 1\n    b1: x";

    [Fact]
    public void P2_reproduces_the_l2_fit()
    {
        // Identity: |e|^2 = e², so lp with p = 2 and l2 have the same objective and the same minimiser; the
        // l2 fit is the closed-form QR path (checked against NIST StRD elsewhere).
        using var fits = new SequentialFits(["x", "y"], Line(40));
        var (_, lp) = fits.Run("lp2", LineModel + "\nloss: {kind: lp, p: 2}");
        var (_, l2) = fits.Run("l2", LineModel + "\nloss: l2");
        Assert.Equal("optimal", Status(lp));
        Assert.Equal("QP-sequence", lp.GetProperty("problem").GetProperty("class").GetString());
        foreach (var name in new[] { "b0", "b1" })
        {
            Assert.True(RelativeDifference(Coefficient(lp, name), Coefficient(l2, name)) <= 1e-9, Describe(lp));
        }
    }

    [Theory]
    [InlineData(1.5)]
    [InlineData(3.0)]
    public void Weighted_fit_matches_an_independent_newton_minimiser(double p)
    {
        // Reference: damped Newton written here on the smooth objective F(b) = Σ w |y − b0 − b1 x|^p from
        // the least-squares start, iterated until the gradient is at rounding level.
        var rows = Line(40);
        using var fits = new SequentialFits(["x", "y"], rows);
        var (_, json) = fits.Run("lpw", "  weight: \"1 + x/5\"\n" + LineModel + $"\nloss: {{kind: lp, p: {p.ToString(System.Globalization.CultureInfo.InvariantCulture)}}}");
        Assert.Equal("optimal", Status(json));
        var x = rows.Select(r => new[] { 1.0, r[0] }).ToList();
        var y = rows.Select(r => r[1]).ToList();
        var w = rows.Select(r => 1 + (r[0] / 5)).ToList();
        var reference = IndependentNewton(x, y, w, p);
        Assert.True(RelativeDifference(Coefficient(json, "b0"), reference[0]) <= 1e-8, $"{reference[0]} vs {Describe(json)}");
        Assert.True(RelativeDifference(Coefficient(json, "b1"), reference[1]) <= 1e-8, $"{reference[1]} vs {Describe(json)}");
    }

    [Fact]
    public void Active_constraint_meets_the_kkt_conditions()
    {
        // KKT for min F(b) s.t. b1 <= c with multiplier μ ≥ 0 (SPEC's dual): ∂F/∂b0 = 0 and ∂F/∂b1 = −μ,
        // computed here from the data and the JSON's coefficients and dual.
        var rows = Line(40);
        using var fits = new SequentialFits(["x", "y"], rows);
        var (_, json) = fits.Run("lpc", LineModel + "\nloss: {kind: lp, p: 1.5}\nconstraints:\n  - \"b1 <= 0.75\"");
        Assert.Equal("optimal", Status(json));
        var kkt = json.GetProperty("verification").GetProperty("optimality_residual").GetDouble();
        Assert.True(kkt <= 1e-9, Describe(json));
        var constraint = json.GetProperty("constraints")[0];
        Assert.True(constraint.GetProperty("active").GetBoolean());
        var mu = constraint.GetProperty("dual").GetDouble();
        Assert.True(mu > 0);
        var b = new[] { Coefficient(json, "b0"), Coefficient(json, "b1") };
        Assert.Equal(0.75, b[1], 12);
        double g0 = 0, g1 = 0, m0 = 0, m1 = 0;
        foreach (var r in rows)
        {
            var e = r[1] - b[0] - (b[1] * r[0]);
            var slope = 1.5 * Math.Sqrt(Math.Abs(e)) * Math.Sign(e);
            g0 -= slope;
            g1 -= slope * r[0];
            m0 += Math.Abs(slope);
            m1 += Math.Abs(slope * r[0]);
        }

        Assert.True(Math.Abs(g0) <= 1e-9 * m0, $"dF/db0 = {g0}");
        Assert.True(Math.Abs(g1 + mu) <= 1e-9 * m1, $"dF/db1 = {g1}, dual {mu}");
    }

    [Fact]
    public void L1_penalty_meets_its_subgradient_condition()
    {
        // Optimality of F(b) + λ|b1| at b1 ≠ 0 (convex, smooth in b0): ∂F/∂b0 = 0 and ∂F/∂b1 = −λ sign(b1),
        // computed here from the data. The penalty enters the QPs as a bound variable and two rows.
        var rows = Line(40);
        using var fits = new SequentialFits(["x", "y"], rows);
        const double lambda = 2.0;
        var (_, json) = fits.Run("lpl1", LineModel + "\nloss: {kind: lp, p: 1.5}\npenalties:\n  - {kind: l1, weight: 2.0}");
        Assert.Equal("optimal", Status(json));
        var b = new[] { Coefficient(json, "b0"), Coefficient(json, "b1") };
        Assert.True(Math.Abs(b[1]) > 0.1, Describe(json));
        double g0 = 0, g1 = 0, m0 = 0, m1 = 0;
        foreach (var r in rows)
        {
            var e = r[1] - b[0] - (b[1] * r[0]);
            var slope = 1.5 * Math.Sqrt(Math.Abs(e)) * Math.Sign(e);
            g0 -= slope;
            g1 -= slope * r[0];
            m0 += Math.Abs(slope);
            m1 += Math.Abs(slope * r[0]);
        }

        Assert.True(Math.Abs(g0) <= 1e-9 * m0, $"dF/db0 = {g0}");
        Assert.True(Math.Abs(g1 + (lambda * Math.Sign(b[1]))) <= 1e-9 * m1, $"dF/db1 = {g1}");
    }

    [Fact]
    public void Lowering_notes_say_how_it_was_solved()
    {
        using var fits = new SequentialFits(["x", "y"], Line(20));
        var (_, json) = fits.Run("lpn", LineModel + "\nloss: {kind: lp, p: 1.5}");
        var notes = json.GetProperty("lowering").EnumerateArray().Select(n => n.GetProperty("how").GetString()!).ToList();
        Assert.Contains(notes, n => n.StartsWith("sequence of QPs (Newton with line search)", StringComparison.Ordinal));
        Assert.Contains(notes, n => n.Contains("Newton steps", StringComparison.Ordinal) && n.Contains("KKT residual", StringComparison.Ordinal));
    }

    // Damped Newton on Σ w |e|^p over (b0, b1), independent of the product: plain arrays, 2×2 solves.
    private static double[] IndependentNewton(List<double[]> x, List<double> y, List<double> w, double p)
    {
        var b = LeastSquares(x, y, w);
        double F(double[] c) => Residuals(x, y, c).Select((e, i) => w[i] * Math.Pow(Math.Abs(e), p)).Sum();
        for (var iteration = 0; iteration < 200; iteration++)
        {
            var e = Residuals(x, y, b);
            var g = new double[2];
            var h = new double[2, 2];
            double scale = 0;
            for (var i = 0; i < e.Length; i++)
            {
                var s = w[i] * p * Math.Pow(Math.Abs(e[i]), p - 1) * Math.Sign(e[i]);
                var c = w[i] * p * (p - 1) * Math.Pow(Math.Max(Math.Abs(e[i]), 1e-12), p - 2);
                for (var j = 0; j < 2; j++)
                {
                    g[j] -= s * x[i][j];
                    scale = Math.Max(scale, Math.Abs(s * x[i][j]));
                    for (var k = 0; k < 2; k++)
                    {
                        h[j, k] += c * x[i][j] * x[i][k];
                    }
                }
            }

            if (Math.Max(Math.Abs(g[0]), Math.Abs(g[1])) <= 1e-14 * scale * e.Length)
            {
                break;
            }

            var d = SolveLinear(h, [-g[0], -g[1]]);
            var f0 = F(b);
            var t = 1.0;
            while (t > 1e-12 && F([b[0] + (t * d[0]), b[1] + (t * d[1])]) > f0)
            {
                t /= 2;
            }

            b = [b[0] + (t * d[0]), b[1] + (t * d[1])];
        }

        return b;
    }
}
