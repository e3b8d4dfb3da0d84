namespace FitSpec.Reporting.Plots;

/// <summary>
/// One figure of a report. Key names it in file names and ids (fit, residuals, histogram, qq); Title and Caption
/// are plain text (templates escape them); FileSvg is a standalone .svg document, InlineSvg the same drawing
/// for inclusion in HTML.
/// </summary>
public sealed record ReportPlot(string Key, string Title, string Caption, string FileSvg, string InlineSvg)
{
    /// <summary>The file the Markdown report links: &lt;fit name&gt;.&lt;key&gt;.svg, beside the .md.</summary>
    public static string FileName(string fitName, string key) => $"{fitName}.{key}.svg";
}
