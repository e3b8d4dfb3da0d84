using System.Buffers.Binary;
using FitSpec.BrowserTests.Support;

namespace FitSpec.BrowserTests;

/// <summary>
/// The harness on hand-written pages, so that its checks are known to pass a good page and to catch each
/// kind of bad one, whatever the real reports contain at the moment.
/// </summary>
[Collection(BrowserCollection.Name)]
public sealed class HarnessSelfTests(BrowserSession browser) : IDisposable
{
    private readonly string _folder = Directory.CreateTempSubdirectory("fitspec-browser-harness-").FullName;

    [BrowserFact]
    public async Task A_page_with_a_sized_svg_passes_and_is_screenshot_whole()
    {
        var html = Write("good.html", """
            <!DOCTYPE html><html><head><meta charset="utf-8"><title>good</title></head>
            <body style="margin:0">
            <svg width="240" height="120" viewBox="0 0 240 120" aria-label="sample plot" role="img">
              <rect x="0" y="0" width="240" height="120" fill="#eef"/><polyline points="0,120 120,30 240,60" fill="none" stroke="#225"/>
            </svg>
            <div style="height:2400px">tall content</div>
            </body></html>
            """);
        await using var page = await browser.OpenAsync(html);
        var svgs = await page.SvgBoxesAsync();
        var png = await page.ScreenshotAsync(Path.Combine(_folder, "good.png"));

        Assert.Equal([new SvgBox(0, 240, 120, "sample plot")], svgs);
        Assert.Empty(ReportChecks.Failures(page.Problems, svgs, plotsRequired: true));
        var (width, height) = PngSize(png);
        Assert.Equal(1280, width);
        Assert.True(height >= 2400 + 120, $"screenshot is {height} px high: not the full page");
    }

    [BrowserFact]
    public async Task Console_errors_uncaught_exceptions_and_failed_loads_are_caught()
    {
        var html = Write("noisy.html", """
            <!DOCTYPE html><html><head><meta charset="utf-8"><title>noisy</title></head><body>
            <script>console.error('deliberate console error');</script>
            <script>throw new Error('deliberate page error');</script>
            <img src="missing-picture.png" alt="">
            <svg width="10" height="10"></svg>
            </body></html>
            """);
        await using var page = await browser.OpenAsync(html);
        var failures = ReportChecks.Failures(page.Problems, await page.SvgBoxesAsync(), plotsRequired: true);

        Assert.Contains(failures, f => f.StartsWith("console error: deliberate console error", StringComparison.Ordinal));
        Assert.Contains(failures, f => f.StartsWith("page error:", StringComparison.Ordinal) && f.Contains("deliberate page error", StringComparison.Ordinal));
        Assert.Contains(failures, f => f.StartsWith("failed request:", StringComparison.Ordinal) && f.Contains("missing-picture.png", StringComparison.Ordinal));
    }

    [BrowserFact]
    public async Task Empty_or_hidden_svgs_and_a_missing_plot_fail()
    {
        var hidden = Write("hidden.html", """
            <!DOCTYPE html><html><head><meta charset="utf-8"><title>hidden</title></head><body>
            <svg width="0" height="50" id="flat"></svg>
            <div style="display:none"><svg width="100" height="100" id="undisplayed"></svg></div>
            <svg width="100" height="100" id="shown"></svg>
            </body></html>
            """);
        await using (var page = await browser.OpenAsync(hidden))
        {
            var failures = ReportChecks.Failures(page.Problems, await page.SvgBoxesAsync(), plotsRequired: true);
            Assert.Equal(["svg #0 'flat': 0 x 50 has an empty bounding box", "svg #1 'undisplayed': 0 x 0 has an empty bounding box"], failures);
        }

        var plain = Write("plain.html", "<!DOCTYPE html><html><head><meta charset=\"utf-8\"><title>plain</title></head><body><p>no plot</p></body></html>");
        await using (var page = await browser.OpenAsync(plain))
        {
            var svgs = await page.SvgBoxesAsync();
            Assert.Equal(["no <svg> plot in a report whose status is not error"], ReportChecks.Failures(page.Problems, svgs, plotsRequired: true));
            Assert.Empty(ReportChecks.Failures(page.Problems, svgs, plotsRequired: false));
        }
    }

    public void Dispose()
    {
        try
        {
            Directory.Delete(_folder, recursive: true);
        }
        catch (IOException)
        {
        }
    }

    private string Write(string name, string html)
    {
        var path = Path.Combine(_folder, name);
        File.WriteAllText(path, html);
        return path;
    }

    /// <summary>Width and height from a PNG's IHDR chunk (bytes 16–23, big-endian), after checking the signature.</summary>
    private static (int Width, int Height) PngSize(string path)
    {
        var bytes = File.ReadAllBytes(path);
        Assert.True(bytes.Length > 24 && bytes.AsSpan(0, 8).SequenceEqual((byte[])[0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A]), path + " is not a PNG");
        return (BinaryPrimitives.ReadInt32BigEndian(bytes.AsSpan(16, 4)), BinaryPrimitives.ReadInt32BigEndian(bytes.AsSpan(20, 4)));
    }
}
