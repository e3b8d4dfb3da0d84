using System.Globalization;
using System.Text.RegularExpressions;
using FitSpec.ReferenceTests.Support;
using static FitSpec.ReferenceTests.Support.PublishedSpecs;

namespace FitSpec.ReferenceTests;

/// <summary>
/// The log-barrier loss against the published stackloss Chebyshev (minimax) fit, stackloss.chebyshev.json
/// (scipy/HiGHS, GLPK and an exact rational vertex): the barrier's domain max|e| &lt; a is empty exactly when
/// a ≤ the minimax value t*, and for a just above t* it is a small polytope around the published vertex.
/// </summary>
public sealed partial class LogBarrierChebyshevTests
{
    private const string File = "published/stackloss.chebyshev.json";

    [GeneratedRegex(@"max \|residual\| under the constraints is ([0-9.eE+-]+)")]
    private static partial Regex MinimaxValue();

    [ReferenceFact]
    public void Limit_below_the_published_minimax_value_is_infeasible_and_names_it()
    {
        var reference = ReferenceData.Json(File);
        var t = ReferenceData.Number(reference.GetProperty("objective"));
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("published/stackloss.csv");
        var limit = (t * (1 - 1e-6)).ToString("R", CultureInfo.InvariantCulture);
        var result = ws.Solve(ws.WriteSpec("sl-barrier-tight", Stackloss("sl-barrier-tight", data, $"{{kind: log-barrier, limit: {limit}}}")));
        Assert.Equal("infeasible", Status(result));
        var detail = result.GetProperty("status_detail").GetString()!;
        var match = MinimaxValue().Match(detail);
        Assert.True(match.Success, detail);
        // The file's tolerance_hint for the objective: relative 1e-9 (the message prints 12 digits).
        var reported = double.Parse(match.Groups[1].Value, CultureInfo.InvariantCulture);
        Assert.True(Math.Abs(reported - t) <= 1e-9 * t, $"{reported} vs published {t}");
    }

    [ReferenceFact]
    public void Limit_just_above_the_minimax_value_stays_in_the_published_ranging_box()
    {
        // Near the unique vertex θ* the set max|e| ≤ t*(1 + δ) is θ* + δ·K for a fixed polytope K (only the
        // vertex's active rows bind, each linear in θ), so its extent in each coefficient is linear in δ. The
        // file's numeric_ranging_width_per_coefficient is that extent at δ = 1e-9; at δ = 1e-6 it is 1000
        // times as wide. Any point with every |e| < limit — the barrier's domain — lies in that box.
        var reference = ReferenceData.Json(File);
        var t = ReferenceData.Number(reference.GetProperty("objective"));
        const double delta = 1e-6;
        var limit = t * (1 + delta);
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("published/stackloss.csv");
        var result = ws.Solve(ws.WriteSpec("sl-barrier", Stackloss("sl-barrier", data, $"{{kind: log-barrier, limit: {limit.ToString("R", CultureInfo.InvariantCulture)}}}")));
        Assert.Equal("optimal", Status(result));
        Assert.Equal("QP-sequence", ProblemClass(result));
        Assert.True(VerificationPassed(result), result.ToString());
        Assert.True(result.GetProperty("metrics").GetProperty("max_abs_residual").GetDouble() < limit);
        var widths = reference.GetProperty("uniqueness_evidence").GetProperty("numeric_ranging_width_per_coefficient");
        var coefficients = result.GetProperty("coefficients");
        foreach (var c in reference.GetProperty("coefficients").EnumerateObject())
        {
            var value = coefficients.GetProperty(CoefficientName(c.Name)).GetDouble();
            var width = ReferenceData.Number(widths.GetProperty(c.Name)) * (delta / 1e-9);
            Assert.True(Math.Abs(value - ReferenceData.Number(c.Value)) <= width, $"{c.Name}: {value} vs {c.Value} (box width {width})");
        }
    }
}
