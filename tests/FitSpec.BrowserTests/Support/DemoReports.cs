using System.Text.Json;

namespace FitSpec.BrowserTests.Support;

/// <summary>
/// The demo specs (specs/*.fit.yaml) solved once, on first use, by one `fitspec solve specs --out DIR` into a
/// temporary folder; removed at the end of the run.
/// </summary>
public sealed class DemoReports : IAsyncLifetime
{
    private readonly SemaphoreSlim _solving = new(1, 1);
    private FitspecRun? _run;

    public static string SpecsFolder { get; } = Path.Combine(FitspecProcess.RepositoryRoot(), "specs");

    /// <summary>The demo spec names (file names without .fit.yaml), the name each report is written under.</summary>
    public static IEnumerable<object[]> Names() =>
        Directory.GetFiles(SpecsFolder, "*.fit.yaml")
            .Select(f => Path.GetFileName(f)[..^".fit.yaml".Length])
            .Order(StringComparer.Ordinal)
            .Select(n => new object[] { n });

    public string Folder { get; } = Path.Combine(Path.GetTempPath(), "fitspec-browser-" + Guid.NewGuid().ToString("N"));

    public TimeSpan SolveTime { get; private set; }

    /// <summary>Solves every demo spec (once) and returns the CLI run.</summary>
    public async Task<FitspecRun> SolvedAsync()
    {
        await _solving.WaitAsync();
        try
        {
            if (_run is null)
            {
                Directory.CreateDirectory(Folder);
                var clock = System.Diagnostics.Stopwatch.StartNew();
                _run = await FitspecProcess.RunAsync(Folder, "solve", SpecsFolder, "--out", Folder);
                SolveTime = clock.Elapsed;
            }

            return _run;
        }
        finally
        {
            _solving.Release();
        }
    }

    public string Html(string name) => Path.Combine(Folder, name + ".html");

    /// <summary>The `status` of the result JSON written beside the report.</summary>
    public string Status(string name)
    {
        using var json = JsonDocument.Parse(File.ReadAllText(Path.Combine(Folder, name + ".result.json")));
        return json.RootElement.GetProperty("status").GetString() ?? "";
    }

    public Task InitializeAsync() => Task.CompletedTask;

    public Task DisposeAsync()
    {
        try
        {
            Directory.Delete(Folder, recursive: true);
        }
        catch (DirectoryNotFoundException)
        {
        }
        catch (IOException)
        {
            // Something still holds a file: the system cleans its temp folder later.
        }

        _solving.Dispose();
        return Task.CompletedTask;
    }
}
