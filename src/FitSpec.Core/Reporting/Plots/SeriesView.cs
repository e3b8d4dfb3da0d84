using System.Globalization;
using FitSpec.Results;

namespace FitSpec.Reporting.Plots;

/// <summary>
/// The per-row arrays of a <see cref="ResidualSeries"/> cut to their common length, with the rows whose values
/// are all finite (a plot cannot place the others), the thinned subset to draw and the rows to highlight.
/// </summary>
internal sealed class SeriesView
{
    /// <summary>How many of the largest residuals the scatter plots mark in a second colour.</summary>
    public const int Marked = 10;

    private SeriesView(ResidualSeries series, int[] finite, ThinnedRows drawn, HashSet<int> marked, double[]? input)
    {
        Series = series;
        Finite = finite;
        Drawn = drawn;
        MarkedRows = marked;
        Input = input;
    }

    public ResidualSeries Series { get; }

    /// <summary>Row indices (into the series arrays) whose observed, fitted and residual values are finite.</summary>
    public int[] Finite { get; }

    /// <summary>The rows drawn, as indices into the series arrays.</summary>
    public ThinnedRows Drawn { get; }

    /// <summary>Rows with the largest |residual|, drawn in the highlight colour.</summary>
    public HashSet<int> MarkedRows { get; }

    /// <summary>The main input's values when the model has one input and they match the rows, else null.</summary>
    public double[]? Input { get; }

    public static SeriesView? Of(ResidualSeries? series)
    {
        if (series is null)
        {
            return null;
        }

        var n = Math.Min(series.Observed.Length, Math.Min(series.Fitted.Length, series.Residuals.Length));
        var input = series.Input is not null && series.InputValues is { } x && x.Length >= n ? x : null;
        var finite = Enumerable.Range(0, n)
            .Where(i => double.IsFinite(series.Observed[i]) && double.IsFinite(series.Fitted[i]) && double.IsFinite(series.Residuals[i])
                && (input is null || double.IsFinite(input[i])))
            .ToArray();
        if (finite.Length == 0)
        {
            return null;
        }

        var residuals = finite.Select(i => series.Residuals[i]).ToArray();
        var thinned = PointThinning.Select(residuals);
        var drawn = new ThinnedRows([.. thinned.Indices.Select(k => finite[k])], thinned.Total, thinned.KeptLargest);
        var marked = PointThinning.Largest(residuals, Math.Min(Marked, finite.Length)).Select(k => finite[k]).ToHashSet();
        return new SeriesView(series, finite, drawn, marked, input);
    }

    /// <summary>A caption sentence about thinning, or empty when every row is drawn.</summary>
    public string ThinningNote() => ThinningNote(Drawn);

    public static string ThinningNote(ThinnedRows rows) => rows.IsThinned
        ? string.Create(CultureInfo.InvariantCulture,
            $" {rows.Indices.Length:N0} of {rows.Total:N0} rows are drawn: an even stride through the data plus the {rows.KeptLargest:N0} largest |residuals|.")
        : "";

    /// <summary>A caption sentence naming the highlighted rows.</summary>
    public string MarkedNote() => MarkedRows.Count switch
    {
        0 => "",
        1 => " The row with the largest |residual| is marked in red.",
        _ => string.Create(CultureInfo.InvariantCulture, $" The {MarkedRows.Count} rows with the largest |residuals| are marked in red."),
    };
}
