using System.Text;
using OxyPlot;

namespace FitSpec.Reporting.Plots;

/// <summary>
/// Measures text with the standard PDF font metrics built into the plotting package (no font files, so the
/// same numbers on every machine), converted to the SVG's pixel units and widened by a margin: a viewer
/// without Arial substitutes another sans-serif, often wider, and labels laid out for the narrower face
/// would overlap tick labels or overflow the legend.
/// </summary>
internal sealed class TextMeasurer : PdfRenderContext
{
    /// <summary>The PDF metrics are in points; SVG font sizes are pixels (96 per inch against 72).</summary>
    public const double PointsToPixels = 96.0 / 72.0;

    /// <summary>Roughly how much wider the common fallback faces set Latin text than Arial.</summary>
    public const double WidthMargin = 1.1;

    public TextMeasurer()
        : base(SvgExport.Width, SvgExport.Height, OxyColors.White)
    {
    }

    public override OxySize MeasureText(string text, string fontFamily, double fontSize, double fontWeight)
    {
        var size = base.MeasureText(Measurable(text), fontFamily, fontSize, fontWeight);
        return new OxySize(size.Width * PointsToPixels * WidthMargin, size.Height * PointsToPixels);
    }

    // The PDF metrics cover Latin-1 only and give other characters (φ, —, …) no width; count each as an 'o'.
    private static string Measurable(string text)
    {
        if (string.IsNullOrEmpty(text) || text.All(c => c <= '\u00FF'))
        {
            return text;
        }

        var sb = new StringBuilder(text.Length);
        foreach (var c in text)
        {
            sb.Append(c <= '\u00FF' ? c : 'o');
        }

        return sb.ToString();
    }
}
