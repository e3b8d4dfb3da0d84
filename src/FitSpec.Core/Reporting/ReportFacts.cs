using FitSpec.Reporting.Plots;
using FitSpec.Results;
using FitSpec.Spec;
using Scriban.Runtime;

namespace FitSpec.Reporting;

/// <summary>
/// Derived facts the templates would otherwise each have to compute (exposed as `report`): headline counts and
/// verdicts, the plots, the largest residuals joined with the input column, and capped line lists.
/// </summary>
internal static class ReportFacts
{
    /// <summary>At most this many data lines are listed inline; the rest are counted.</summary>
    public const int LinesShown = 100;

    public static ScriptObject Build(FitResult result, ReportFormat format, IReadOnlyList<ReportPlot> plots)
    {
        var failed = result.Acceptance.Count(a => !a.Passed);
        var facts = new ScriptObject
        {
            ["heading"] = string.IsNullOrWhiteSpace(result.Title) ? result.Name : result.Title,
            ["format"] = format == ReportFormat.Html ? "html" : "md",
            ["caution"] = ReportRenderer.Caution,
            ["has_errors"] = result.Errors.Count > 0,
            ["has_solution"] = result.Coefficients.Count > 0 || result.Metrics is not null || result.Objective is not null,
            ["status_class"] = StatusClass(result.Status),
            ["has_shape"] = result.Constraints.Any(c => c.Grid is not null || c.FineGridWorst is not null || c.FineGridPoints is not null),
            ["has_closed_form_check"] = result.Verification?.Stationarity is not null,
            ["plots"] = plots.Select(p => Plot(result, p)).ToList(),
            ["has_plots"] = plots.Count > 0,
            ["is_least_squares"] = ReportPlots.IsLeastSquares(result),
            ["input"] = result.Series?.InputValues is not null ? result.Series.Input : null,
            ["largest"] = Largest(result),
            ["outliers"] = Lines(result.OutlierLines),
            ["outside_width"] = Lines(result.OutsideWidthLines),
            ["acceptance_total"] = result.Acceptance.Count,
            ["acceptance_failed"] = failed,
            ["acceptance_verdict"] = result.Acceptance.Count == 0 ? null : failed == 0 ? "PASS" : "FAIL",
            ["constraints_active"] = result.Constraints.Count(c => c.Active),
            ["leverage_flagged"] = result.Leverage?.Highest.Count(r => r.Value > result.Leverage.Threshold) ?? 0,
            ["has_uncertainty"] = result.Uncertainty is { } u && (u.Classical is { Count: > 0 } || u.Bootstrap is not null),
            ["has_ranging"] = result.Ranging is { } r && (r.Constraints.Count > 0 || r.Coefficients.Count > 0 || r.Note is not null),
        };
        return facts;
    }

    private static ScriptObject Plot(FitResult result, ReportPlot plot) => new()
    {
        ["key"] = plot.Key,
        ["title"] = plot.Title,
        ["caption"] = plot.Caption,
        ["svg"] = plot.InlineSvg,
        ["file"] = ReportPlot.FileName(result.Name, plot.Key),
    };

    // The largest residuals with the main input's value at that row, when the model has one input.
    private static List<ScriptObject> Largest(FitResult result)
    {
        var x = result.Series?.InputValues;
        return result.LargestResiduals.Select(r => new ScriptObject
        {
            ["row"] = r.Row,
            ["line"] = r.Line,
            ["input"] = x is not null && r.Row >= 1 && r.Row <= x.Length ? x[r.Row - 1] : null,
            ["observed"] = r.Observed,
            ["fitted"] = r.Fitted,
            ["residual"] = r.Residual,
        }).ToList();
    }

    private static ScriptObject Lines(IReadOnlyList<int> lines) => new()
    {
        ["count"] = lines.Count,
        ["shown"] = lines.Take(LinesShown).ToList(),
        ["more"] = Math.Max(0, lines.Count - LinesShown),
    };

    // A fixed set of class names so status text never reaches an attribute unchecked.
    private static string StatusClass(string status) => status switch
    {
        "optimal" => "ok",
        "local-optimum" => "local",
        "time-limit" => "warn",
        "infeasible" or "unbounded" or "error" => "bad",
        _ => "other",
    };
}
