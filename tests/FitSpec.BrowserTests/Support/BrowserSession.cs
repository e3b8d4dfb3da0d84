using System.Diagnostics;
using Microsoft.Playwright;

namespace FitSpec.BrowserTests.Support;

/// <summary>
/// One headless Chromium for every page of the test run, started on first use (so skipped tests start
/// nothing). Each page gets its own browser context, so no state leaks from one report to the next.
/// </summary>
public sealed class BrowserSession : IAsyncLifetime
{
    private readonly SemaphoreSlim _starting = new(1, 1);
    private IPlaywright? _playwright;
    private IBrowser? _browser;

    /// <summary>Time to start the package's node driver.</summary>
    public TimeSpan DriverStartup { get; private set; }

    /// <summary>Time from asking for the browser to a connected browser.</summary>
    public TimeSpan BrowserLaunch { get; private set; }

    public string? BrowserVersion => _browser?.Version;

    public Task InitializeAsync() => Task.CompletedTask;

    /// <summary>Opens a local HTML file from file://, waits for its load event and one rendered frame.</summary>
    public async Task<ReportPage> OpenAsync(string htmlFile)
    {
        var browser = await BrowserAsync();
        var context = await browser.NewContextAsync(new BrowserNewContextOptions
        {
            ViewportSize = new ViewportSize { Width = 1280, Height = 900 },
            DeviceScaleFactor = 1,
        });
        context.SetDefaultTimeout(15_000);
        var page = await context.NewPageAsync();
        var reportPage = new ReportPage(context, page);
        await page.GotoAsync(new Uri(Path.GetFullPath(htmlFile)).AbsoluteUri, new PageGotoOptions { WaitUntil = WaitUntilState.Load });
        await page.EvaluateAsync("() => new Promise(done => requestAnimationFrame(() => requestAnimationFrame(done)))");
        return reportPage;
    }

    public async Task DisposeAsync()
    {
        if (_browser is not null)
        {
            await _browser.CloseAsync();
        }

        _playwright?.Dispose();
        _starting.Dispose();
    }

    private async Task<IBrowser> BrowserAsync()
    {
        await _starting.WaitAsync();
        try
        {
            if (_browser is null)
            {
                Chromium.Require();
                var clock = Stopwatch.StartNew();
                _playwright = await Playwright.CreateAsync();
                DriverStartup = clock.Elapsed;
                _browser = await _playwright.Chromium.LaunchAsync(new BrowserTypeLaunchOptions
                {
                    // Debian's browser, never one downloaded by the package's installer.
                    ExecutablePath = Chromium.Executable,
                    Headless = true,
                    // Containers often have a tiny /dev/shm; shared memory there crashes renderers.
                    Args = ["--disable-dev-shm-usage"],
                    Timeout = 30_000,
                });
                BrowserLaunch = clock.Elapsed - DriverStartup;
            }

            return _browser;
        }
        finally
        {
            _starting.Release();
        }
    }
}
