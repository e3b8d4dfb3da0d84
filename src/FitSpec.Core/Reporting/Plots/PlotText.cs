using System.Text;

namespace FitSpec.Reporting.Plots;

/// <summary>User text (column names) made fit for a plot label: one line, no characters XML cannot carry.</summary>
internal static class PlotText
{
    public const int MaxLength = 60;

    /// <summary>Drops control characters and unpaired surrogates, which an XML writer would refuse.</summary>
    public static string Clean(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var sb = new StringBuilder(text.Length);
        for (var i = 0; i < text.Length; i++)
        {
            var ch = text[i];
            if (char.IsHighSurrogate(ch) && i + 1 < text.Length && char.IsLowSurrogate(text[i + 1]))
            {
                sb.Append(ch).Append(text[++i]);
            }
            else if (char.IsSurrogate(ch) || ch is '\uFFFE' or '\uFFFF')
            {
                continue;
            }
            else if (char.IsControl(ch))
            {
                sb.Append(' ');
            }
            else
            {
                sb.Append(ch);
            }
        }

        return sb.ToString();
    }

    /// <summary>
    /// A label: cleaned, without the backticks the tool's own labels use to mark code (a plot cannot set code
    /// apart), and shortened with an ellipsis so a long column name cannot cover the plot.
    /// </summary>
    public static string Label(string text)
    {
        var clean = Clean(text).Replace("`", "", StringComparison.Ordinal).Trim();
        return clean.Length <= MaxLength ? clean : clean[..(MaxLength - 1)] + "…";
    }
}
