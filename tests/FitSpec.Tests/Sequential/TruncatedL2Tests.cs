using static FitSpec.Tests.Sequential.SequentialFits;

namespace FitSpec.Tests.Sequential;

/// <summary>The truncated square min(e², c²), non-convex: a local method, flagged as such.</summary>
public sealed class TruncatedL2Tests
{
    private const string LineModel = "model:\n  response: y\n  terms:\n    b0: 1\n    b1: x";

    private static readonly int[] Gross = [4, 17, 31];

    [Fact]
    public void Gross_outliers_are_listed_and_the_fit_is_least_squares_on_the_inliers()
    {
        // Local-optimality argument: where every inlier has |e| < c and every outlier |e| > c, the objective
        // near the point is Σ_inliers w e² + (number of outliers)·c², so a local minimum is exactly the least
        // squares fit on the inliers (computed here by the normal equations). The three rows shifted by +6
        // (noise 0.2, cap 1) are the outliers; the constraint is far from active, so it does not change that.
        var rows = Line(40, gross: Gross, shift: 6);
        using var fits = new SequentialFits(["x", "y"], rows);
        var (result, json) = fits.Run("tr", LineModel + "\nloss: {kind: truncated-l2, cap: 1}\nconstraints:\n  - \"b1 <= 100\"");
        Assert.Equal("local-optimum", Status(json));
        Assert.Equal(0, result.ExitCode);
        Assert.Equal("local", json.GetProperty("problem").GetProperty("class").GetString());

        // Data-file lines: the header is line 1, row i (0-based) is line i + 2.
        var lines = json.GetProperty("outliers").EnumerateArray().Select(e => e.GetInt32()).ToArray();
        Assert.Equal(Gross.Select(i => i + 2).ToArray(), lines);

        var inliers = Enumerable.Range(0, rows.Count).Where(i => !Gross.Contains(i)).ToList();
        var reference = LeastSquares(inliers.Select(i => new[] { 1.0, rows[i][0] }).ToList(), inliers.Select(i => rows[i][1]).ToList());
        Assert.True(RelativeDifference(Coefficient(json, "b0"), reference[0]) <= 1e-9, Describe(json));
        Assert.True(RelativeDifference(Coefficient(json, "b1"), reference[1]) <= 1e-9, Describe(json));

        // The classification is strict at the returned point (what makes it a local minimum).
        var b = new[] { Coefficient(json, "b0"), Coefficient(json, "b1") };
        var e = Residuals(rows.Select(r => new[] { 1.0, r[0] }).ToList(), rows.Select(r => r[1]).ToList(), b);
        for (var i = 0; i < e.Length; i++)
        {
            Assert.True(Gross.Contains(i) ? Math.Abs(e[i]) > 1 : Math.Abs(e[i]) < 1, $"row {i}: e = {e[i]}");
        }

        // SPEC: objective Σ w min(e², c²), recomputed here; non-convex fits report no duals.
        var objective = e.Sum(v => Math.Min(v * v, 1));
        Assert.True(RelativeDifference(json.GetProperty("objective").GetDouble(), objective) <= 1e-12);
        foreach (var c in json.GetProperty("constraints").EnumerateArray())
        {
            Assert.Equal(System.Text.Json.JsonValueKind.Null, c.GetProperty("dual").ValueKind);
        }
    }

    [Fact]
    public void Notes_say_it_is_a_local_optimum_from_three_starts()
    {
        using var fits = new SequentialFits(["x", "y"], Line(30, gross: [3], shift: 5));
        var (_, json) = fits.Run("trn", LineModel + "\nloss: {kind: truncated-l2, cap: 1}");
        var notes = json.GetProperty("lowering").EnumerateArray().Select(n => n.GetProperty("how").GetString()!).ToList();
        Assert.Contains(notes, n => n.StartsWith("local method: alternating inlier/outlier least squares from 3 starts", StringComparison.Ordinal));
        Assert.Contains(notes, n => n.Contains("a local optimum, not proven global", StringComparison.Ordinal) && n.Contains("rounds", StringComparison.Ordinal));
        Assert.Contains("local optimum", json.GetProperty("status_detail").GetString()!, StringComparison.Ordinal);
    }

    [Fact]
    public void Other_fits_list_no_outliers()
    {
        using var fits = new SequentialFits(["x", "y"], Line(20));
        var (_, json) = fits.Run("l1", LineModel + "\nloss: l1");
        Assert.Equal(0, json.GetProperty("outliers").GetArrayLength());
    }
}
