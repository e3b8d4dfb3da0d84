using FitSpec.BrowserTests.Support;
using Xunit.Abstractions;

namespace FitSpec.BrowserTests;

/// <summary>
/// Every demo report, as written by `fitspec solve specs`, opened in headless Chromium from file://: it must
/// load without console errors, page errors or failed loads, every &lt;svg&gt; must take up room on the page,
/// and a report whose fit did not end in error must show at least one plot. A full-page screenshot of each
/// is kept under TestResults/browser beside the test assembly.
/// </summary>
[Collection(BrowserCollection.Name)]
public sealed class DemoReportPageTests(BrowserSession browser, DemoReports reports, ITestOutputHelper output)
{
    [Fact]
    public async Task Every_demo_spec_writes_an_html_report_and_a_result()
    {
        var run = await reports.SolvedAsync();
        Assert.DoesNotContain("   at ", run.Stderr, StringComparison.Ordinal);
        var names = DemoReports.Names().Select(n => (string)n[0]).ToList();
        Assert.NotEmpty(names);
        foreach (var name in names)
        {
            Assert.True(File.Exists(reports.Html(name)), $"no {name}.html in {reports.Folder}; CLI run: {run}");
            Assert.True(File.Exists(Path.Combine(reports.Folder, name + ".result.json")), $"no {name}.result.json; CLI run: {run}");
        }

        output.WriteLine($"solved {names.Count} demo specs in {reports.SolveTime.TotalSeconds:F2} s");
    }

    [BrowserTheory]
    [MemberData(nameof(DemoReports.Names), MemberType = typeof(DemoReports))]
    public async Task Demo_report_renders_without_errors_and_with_visible_plots(string name)
    {
        var run = await reports.SolvedAsync();
        Assert.True(File.Exists(reports.Html(name)), $"no {name}.html; CLI run: {run}");
        var status = reports.Status(name);

        var clock = System.Diagnostics.Stopwatch.StartNew();
        await using var page = await browser.OpenAsync(reports.Html(name));
        var opened = clock.Elapsed;
        var svgs = await page.SvgBoxesAsync();
        var png = await page.ScreenshotAsync(Screenshots.For(name));
        var shot = clock.Elapsed - opened;

        output.WriteLine($"Chromium {browser.BrowserVersion}: driver started in {browser.DriverStartup.TotalSeconds:F2} s, browser launched in {browser.BrowserLaunch.TotalSeconds:F2} s");
        output.WriteLine($"{name}: status {status}, opened in {opened.TotalSeconds:F2} s, {svgs.Count} svg");
        foreach (var svg in svgs)
        {
            output.WriteLine("  " + svg);
        }

        output.WriteLine($"screenshot ({shot.TotalSeconds:F2} s): {png}");

        var failures = ReportChecks.Failures(page.Problems, svgs, plotsRequired: status != "error");
        Assert.True(failures.Count == 0, $"{name}.html (status {status}):{Environment.NewLine}  " + string.Join(Environment.NewLine + "  ", failures));
    }
}
