using FitSpec.Pipeline;

namespace FitSpec.Tests.Pipeline;

/// <summary>
/// Two runs on the same inputs write byte-identical files (every format, plots included): nothing in a result
/// depends on the clock, the thread schedule or hash ordering unless a stamp is asked for.
/// </summary>
public sealed class DeterminismTests : IDisposable
{
    private readonly Support.TempFolder _temp = new("fitspec-determinism");

    private static string SpecsFolder
    {
        get
        {
            var dir = AppContext.BaseDirectory;
            while (dir is not null && !Directory.Exists(Path.Combine(dir, "specs")))
            {
                dir = Path.GetDirectoryName(dir);
            }

            return Path.Combine(dir ?? throw new DirectoryNotFoundException("specs folder above the test assembly"), "specs");
        }
    }

    private void RunAll(string outDir, RunSettings settings)
    {
        foreach (var spec in SpecDiscovery.Find([SpecsFolder], out _))
        {
            var outcome = FitRunner.RunForOutput(spec, settings);
            OutputWriter.Write(outcome.Result, outDir, outcome.Formats, outcome.TemplateFolder);
        }
    }

    [Fact]
    public void Every_demo_output_is_byte_identical_across_runs()
    {
        var settings = new RunSettings("fitspec solve specs --out reports", false);
        var first = Path.Combine(_temp.Path, "a");
        var second = Path.Combine(_temp.Path, "b");
        RunAll(first, settings);
        RunAll(second, settings);
        var files = Directory.GetFiles(first).Select(Path.GetFileName).Order(StringComparer.Ordinal).ToList();
        Assert.Equal(files, Directory.GetFiles(second).Select(Path.GetFileName).Order(StringComparer.Ordinal).ToList());
        Assert.Contains(files, f => f!.EndsWith(".html", StringComparison.Ordinal));
        foreach (var f in files)
        {
            Assert.True(File.ReadAllBytes(Path.Combine(first, f!)).AsSpan().SequenceEqual(File.ReadAllBytes(Path.Combine(second, f!))), $"{f} differs between two runs");
        }
    }

    [Fact]
    public void A_stamp_adds_the_time_and_the_solve_seconds()
    {
        var spec = SpecDiscovery.Find([SpecsFolder], out _).First(s => s.Contains("lc7", StringComparison.Ordinal));
        var plain = Results.ResultJson.Write(FitRunner.RunForOutput(spec, new RunSettings("x", false)).Result);
        var stamped = Results.ResultJson.Write(FitRunner.RunForOutput(spec, new RunSettings("x", true)).Result);
        Assert.DoesNotContain("solve_seconds", plain, StringComparison.Ordinal);
        Assert.Contains("\"stamp\": null", plain, StringComparison.Ordinal);
        Assert.Contains("solve_seconds", stamped, StringComparison.Ordinal);
        Assert.Matches("\"stamp\": \"\\d{4}-\\d\\d-\\d\\dT\\d\\d:\\d\\d:\\d\\dZ\"", stamped);
        Assert.Contains("\"command_line\": \"x\"", plain, StringComparison.Ordinal);
    }

    public void Dispose() => _temp.Dispose();
}
