using System.Text.Json;
using FitSpec.BrowserTests.Support;
using Xunit.Abstractions;

namespace FitSpec.BrowserTests;

/// <summary>
/// A report of a fit whose title, description, column names and coefficient names are markup must show that
/// markup as text, in the HTML and in the plots' SVG, and run none of it.
/// </summary>
[Collection(BrowserCollection.Name)]
public sealed class CraftedReportTests(BrowserSession browser, ITestOutputHelper output)
{
    private const string Script = "<script>window.__pwned=1</script>";
    private const string Image = "<img src=x onerror=\"window.__pwned=1\">";

    // The response and the predictor are columns used in expressions (back-quoted); the k… columns become
    // coefficients through a column glob, so those coefficient names are markup too.
    private const string Data = """
        "y <script>window.__pwned=1</script>","x <img src=x onerror=""window.__pwned=1"">","k<script>window.__pwned=1</script>","k<img src=x onerror=""window.__pwned=1"">"
        1.52,0,1,0
        2.71,1,0,1
        6.08,2,2,1
        7.39,3,1,0
        10.05,4,3,2
        10.62,5,0,1
        13.49,6,1,0
        15.33,7,2,3
        """;

    private const string Spec = """
        fitspec: 1
        name: crafted
        title: "Crafted title <script>window.__pwned=1</script> <img src=x onerror=\"window.__pwned=1\">"
        description: "Crafted description <script>window.__pwned=1</script> <img src=x onerror=\"window.__pwned=1\">"
        data:
          path: crafted.csv
        model:
          response: "`y <script>window.__pwned=1</script>`"
          terms:
            b0: 1
            b1: "`x <img src=x onerror=\"window.__pwned=1\">`"
            k: {columns: "k<*"}
        loss: l2
        report:
          formats: [html, json]
        """;

    [BrowserFact]
    public async Task Markup_in_names_and_text_is_shown_literally_and_never_runs()
    {
        var folder = Path.Combine(Path.GetTempPath(), "fitspec-crafted-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(folder);
        try
        {
            File.WriteAllText(Path.Combine(folder, "crafted.csv"), Data + "\n");
            File.WriteAllText(Path.Combine(folder, "crafted.fit.yaml"), Spec + "\n");
            var run = await FitspecProcess.RunAsync(folder, "solve", "crafted.fit.yaml", "--out", "out");
            var html = Path.Combine(folder, "out", "crafted.html");
            Assert.True(File.Exists(html), "no report written: " + run);
            using (var json = JsonDocument.Parse(File.ReadAllText(Path.Combine(folder, "out", "crafted.result.json"))))
            {
                // An error report would leave out the fitted sections where the names appear.
                Assert.Equal("optimal", json.RootElement.GetProperty("status").GetString());
            }

            await using var page = await browser.OpenAsync(html);
            await page.ScreenshotAsync(Screenshots.For("crafted"));
            output.WriteLine("screenshot: " + Screenshots.For("crafted"));

            Assert.True(await page.Page.EvaluateAsync<bool>("() => typeof window.__pwned === 'undefined'"), "window.__pwned was set: markup from the spec or data ran");
            Assert.Equal(0, await page.Page.EvaluateAsync<int>("() => document.querySelectorAll('[onerror], img[src=\"x\"]').length"));
            Assert.Equal(0, await page.Page.EvaluateAsync<int>("() => Array.from(document.scripts).filter(s => s.textContent.includes('__pwned')).length"));

            var title = $"Crafted title {Script} {Image}";
            Assert.Contains(title, await page.Page.TitleAsync(), StringComparison.Ordinal);
            var text = await page.Page.EvaluateAsync<string>("() => document.body.innerText");
            foreach (var literal in new[]
            {
                title,
                $"Crafted description {Script} {Image}",
                "y " + Script, // response column
                "x " + Image, // predictor column
                "k" + Script, // coefficient named after a column
                "k" + Image,
            })
            {
                Assert.True(text.Contains(literal, StringComparison.Ordinal), $"the page text does not show {literal} literally");
            }

            // The plots label their axes with column names: the markup must reach the SVG text as text too.
            Assert.True(
                await page.Page.EvaluateAsync<bool>("() => Array.from(document.querySelectorAll('svg text')).some(t => t.textContent.includes('<script>window.__pwned=1</script>'))"),
                "no plot label shows the markup column name literally (plots missing, or the name was dropped or mangled)");

            var failures = ReportChecks.Failures(page.Problems, await page.SvgBoxesAsync(), plotsRequired: true);
            Assert.True(failures.Count == 0, string.Join(Environment.NewLine, failures));
        }
        finally
        {
            try
            {
                Directory.Delete(folder, recursive: true);
            }
            catch (IOException)
            {
            }
        }
    }
}
