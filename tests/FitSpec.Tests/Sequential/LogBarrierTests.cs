using System.Globalization;
using System.Text.RegularExpressions;
using static FitSpec.Tests.Sequential.SequentialFits;

namespace FitSpec.Tests.Sequential;

/// <summary>The log-barrier loss −a² log(1 − (e/a)²), |e| &lt; a, solved as a sequence of QPs.</summary>
public sealed partial class LogBarrierTests
{
    private const string LineModel = "model:\n  response: y\n  terms:\n    b0: 1\n    b1: x";

    [GeneratedRegex(@"max \|residual\| under the constraints is ([0-9.eE+-]+)")]
    private static partial Regex MinimaxValue();

    [Fact]
    public void Returned_point_meets_the_kkt_conditions_inside_the_limit()
    {
        // KKT for min Σ w φ(e) s.t. b1 >= c (SPEC's dual μ ≥ 0 = the objective's fall per unit relaxation):
        // ∂F/∂b0 = 0 and ∂F/∂b1 = μ, with φ'(e) = 2e/(1 − (e/a)²), computed here from the data, the JSON's
        // coefficients and its dual. The limit 1.5 lies above the data's spread (noise 0.2, gross rows +1).
        var rows = Line(40, gross: [5, 30], shift: 1.0);
        const double limit = 1.5;
        using var fits = new SequentialFits(["x", "y"], rows);
        var (_, json) = fits.Run("lb", "  weight: \"1 + x/10\"\n" + LineModel
            + $"\nloss: {{kind: log-barrier, limit: {limit.ToString(CultureInfo.InvariantCulture)}}}\nconstraints:\n  - \"b1 >= 0.81\"");
        Assert.Equal("optimal", Status(json));
        Assert.Equal("QP-sequence", json.GetProperty("problem").GetProperty("class").GetString());
        var constraint = json.GetProperty("constraints")[0];
        Assert.True(constraint.GetProperty("active").GetBoolean(), Describe(json));
        var mu = constraint.GetProperty("dual").GetDouble();
        var b0 = Coefficient(json, "b0");
        var b1 = Coefficient(json, "b1");
        double g0 = 0, g1 = 0, m0 = 0, m1 = 0;
        foreach (var r in rows)
        {
            var e = r[1] - b0 - (b1 * r[0]);
            Assert.True(Math.Abs(e) < limit, $"|e| = {Math.Abs(e)} at x = {r[0]}");
            var u = e / limit;
            var slope = (1 + (r[0] / 10)) * 2 * e / (1 - (u * u));
            g0 -= slope;
            g1 -= slope * r[0];
            m0 += Math.Abs(slope);
            m1 += Math.Abs(slope * r[0]);
        }

        Assert.True(Math.Abs(g0) <= 1e-9 * m0, $"dF/db0 = {g0} (scale {m0})");
        Assert.True(Math.Abs(g1 - mu) <= 1e-9 * m1, $"dF/db1 = {g1}, dual {mu} (scale {m1})");
        Assert.True(json.GetProperty("verification").GetProperty("optimality_residual").GetDouble() <= 1e-9);
    }

    [Fact]
    public void Limit_below_the_minimax_value_is_infeasible_with_the_evidence()
    {
        // Known identity: with a constant model the smallest achievable max |y − b0| is (max y − min y)/2
        // (the midpoint of the range).
        var rows = Line(30);
        var minimax = (rows.Max(r => r[1]) - rows.Min(r => r[1])) / 2;
        using var fits = new SequentialFits(["x", "y"], rows);
        var limit = (0.9 * minimax).ToString("R", CultureInfo.InvariantCulture);
        var (result, json) = fits.Run("lbi", $"model:\n  response: y\n  terms:\n    b0: 1\nloss: {{kind: log-barrier, limit: {limit}}}");
        Assert.Equal("infeasible", Status(json));
        Assert.Equal(3, result.ExitCode);
        var detail = json.GetProperty("status_detail").GetString()!;
        var match = MinimaxValue().Match(detail);
        Assert.True(match.Success, detail);
        var reported = double.Parse(match.Groups[1].Value, CultureInfo.InvariantCulture);
        Assert.True(Math.Abs(reported - minimax) <= 1e-9 * minimax, $"{reported} vs {minimax}: {detail}");
    }

    [Fact]
    public void Scaling_y_and_the_limit_scales_the_coefficients()
    {
        // Identity: φ_{ca}(c e) = c² φ_a(e), so with y → c y and a → c a the objective is c² times the old one
        // at b → c b: the minimiser scales by c.
        const double c = 37.5;
        var rows = Line(40, gross: [12], shift: 0.8);
        var scaled = rows.Select(r => new[] { r[0], c * r[1] }).ToList();
        using var plain = new SequentialFits(["x", "y"], rows);
        using var big = new SequentialFits(["x", "y"], scaled);
        var (_, a) = plain.Run("lbs", LineModel + "\nloss: {kind: log-barrier, limit: 1.2}");
        var (_, b) = big.Run("lbs", LineModel + $"\nloss: {{kind: log-barrier, limit: {(c * 1.2).ToString("R", CultureInfo.InvariantCulture)}}}");
        Assert.Equal("optimal", Status(a));
        Assert.Equal("optimal", Status(b));
        foreach (var name in new[] { "b0", "b1" })
        {
            var expected = c * Coefficient(a, name);
            Assert.True(Math.Abs(Coefficient(b, name) - expected) <= 1e-8 * Math.Max(1, Math.Abs(expected)), $"{name}: {Coefficient(b, name)} vs {expected}");
        }
    }

    [Fact]
    public void Large_limit_approaches_least_squares()
    {
        // −a² log(1 − e²/a²) = e² + e⁴/(2a²) + …: as a grows the fit tends to l2, the difference O(1/a²).
        using var fits = new SequentialFits(["x", "y"], Line(40));
        var (_, lb) = fits.Run("lbl", LineModel + "\nloss: {kind: log-barrier, limit: 1.0e4}");
        var (_, l2) = fits.Run("l2", LineModel + "\nloss: l2");
        Assert.Equal("optimal", Status(lb));
        Assert.True(RelativeDifference(Coefficient(lb, "b1"), Coefficient(l2, "b1")) <= 1e-7, Describe(lb));
    }

    [Fact]
    public void Lowering_notes_say_how_it_was_solved()
    {
        using var fits = new SequentialFits(["x", "y"], Line(20));
        var (_, json) = fits.Run("lbn", LineModel + "\nloss: {kind: log-barrier, limit: 2}");
        var notes = json.GetProperty("lowering").EnumerateArray().Select(n => n.GetProperty("how").GetString()!).ToList();
        Assert.Contains(notes, n => n.StartsWith("sequence of QPs (Newton with line search)", StringComparison.Ordinal));
        Assert.Contains(notes, n => n.Contains("minimax LP", StringComparison.Ordinal) && n.Contains("KKT residual", StringComparison.Ordinal));
    }
}
