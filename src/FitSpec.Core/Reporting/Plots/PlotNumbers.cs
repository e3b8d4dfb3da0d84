using System.Globalization;

namespace FitSpec.Reporting.Plots;

/// <summary>Numbers in plot labels and captions: six significant digits, invariant culture.</summary>
internal static class PlotNumbers
{
    public static string Short(double value) => value == 0 ? "0" : value.ToString("G6", CultureInfo.InvariantCulture);
}
