namespace FitSpec.BrowserTests.Support;

/// <summary>What a rendered report page must satisfy; returns every failure found (empty when it passes).</summary>
public static class ReportChecks
{
    /// <param name="problems">Console errors, page errors and failed requests the page reported.</param>
    /// <param name="svgs">The measured &lt;svg&gt; elements.</param>
    /// <param name="plotsRequired">True for a report whose fit did not end in error: it must show at least one plot.</param>
    public static IReadOnlyList<string> Failures(IReadOnlyList<string> problems, IReadOnlyList<SvgBox> svgs, bool plotsRequired)
    {
        var failures = new List<string>(problems);
        failures.AddRange(svgs.Where(s => !(s.Width > 0 && s.Height > 0)).Select(s => $"{s} has an empty bounding box"));
        if (plotsRequired && svgs.Count == 0)
        {
            failures.Add("no <svg> plot in a report whose status is not error");
        }

        return failures;
    }
}
