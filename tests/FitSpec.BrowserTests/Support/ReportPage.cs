using System.Text.Json;
using Microsoft.Playwright;

namespace FitSpec.BrowserTests.Support;

/// <summary>The rendered size of one &lt;svg&gt; element, in CSS pixels.</summary>
public sealed record SvgBox(int Index, double Width, double Height, string Label)
{
    public override string ToString() => $"svg #{Index}{(Label.Length > 0 ? " '" + Label + "'" : "")}: {Width} x {Height}";
}

/// <summary>
/// An open page and everything it reported from the moment it was created: console errors, uncaught
/// exceptions and failed requests (a report must be self-contained, so any failed load is a defect).
/// </summary>
public sealed class ReportPage : IAsyncDisposable
{
    private const string MeasureSvgs = """
        () => Array.from(document.querySelectorAll('svg')).map((svg, index) => {
          const box = svg.getBoundingClientRect();
          const label = svg.getAttribute('aria-label') || svg.id || '';
          return { index, width: box.width, height: box.height, label };
        })
        """;

    private readonly IBrowserContext _context;
    private readonly List<string> _problems = [];

    internal ReportPage(IBrowserContext context, IPage page)
    {
        _context = context;
        Page = page;
        page.Console += (_, message) =>
        {
            if (message.Type == "error")
            {
                Add($"console error: {message.Text} (at {message.Location})");
            }
        };
        page.PageError += (_, error) => Add($"page error: {error}");
        page.RequestFailed += (_, request) => Add($"failed request: {request.Url} ({request.Failure})");
    }

    public IPage Page { get; }

    public IReadOnlyList<string> Problems
    {
        get
        {
            lock (_problems)
            {
                return [.. _problems];
            }
        }
    }

    /// <summary>getBoundingClientRect of every &lt;svg&gt; in the document, nested ones included.</summary>
    public async Task<IReadOnlyList<SvgBox>> SvgBoxesAsync()
    {
        var measured = await Page.EvaluateAsync<JsonElement>(MeasureSvgs);
        return [.. measured.EnumerateArray().Select(e => new SvgBox(
            e.GetProperty("index").GetInt32(),
            e.GetProperty("width").GetDouble(),
            e.GetProperty("height").GetDouble(),
            e.GetProperty("label").GetString() ?? ""))];
    }

    /// <summary>Saves a full-page PNG (folders created); returns its path.</summary>
    public async Task<string> ScreenshotAsync(string pngPath)
    {
        Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(pngPath))!);
        await Page.ScreenshotAsync(new PageScreenshotOptions { Path = pngPath, FullPage = true, Type = ScreenshotType.Png });
        return pngPath;
    }

    public async ValueTask DisposeAsync() => await _context.CloseAsync();

    private void Add(string problem)
    {
        lock (_problems)
        {
            _problems.Add(problem);
        }
    }
}
