using FitSpec.Results;

namespace FitSpec.Reporting.Plots;

/// <summary>
/// The figures a result supports, each only when its data is there: the fit, residuals against fitted values,
/// the residual histogram (with φ(r) when the loss curve is given) and, for l2 fits, the normal quantile plot.
/// Reads only the result; never re-solves.
/// </summary>
public static class ReportPlots
{
    /// <summary>Every key a plot may have, in report order (also the files a Markdown report may link).</summary>
    public static IReadOnlyList<string> Keys { get; } = [FitPlot.Key, ResidualPlot.Key, ResidualHistogram.Key, NormalQuantilePlot.Key];

    public static IReadOnlyList<ReportPlot> Build(FitResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        if (result.Errors.Count > 0 || SeriesView.Of(result.Series) is not { } view)
        {
            return [];
        }

        var plots = new List<ReportPlot>
        {
            FitPlot.Build(view),
            ResidualPlot.Build(view, result.Guides),
            ResidualHistogram.Build(view, result.LossCurve, result.Guides),
        };
        if (IsLeastSquares(result) && NormalQuantilePlot.Build(view) is { } qq)
        {
            plots.Add(qq);
        }

        return plots;
    }

    /// <summary>True for loss l2 (the statement's loss is the kind name, followed by a parameter for other kinds).</summary>
    public static bool IsLeastSquares(FitResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        var loss = result.Statement?.Loss ?? result.LossCurve?.Loss;
        if (loss is null)
        {
            return false;
        }

        var kind = loss.Split(' ', 2)[0];
        return string.Equals(kind, "l2", StringComparison.OrdinalIgnoreCase);
    }
}
