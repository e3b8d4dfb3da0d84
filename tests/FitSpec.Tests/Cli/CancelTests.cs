using System.Collections.Concurrent;
using System.Diagnostics;
using FitSpec.Pipeline;
using FitSpec.Pipeline.Batch;
using FitSpec.Solving;
using static FitSpec.Tests.Cli.BatchSpecs;
using static FitSpec.Tests.Cli.CancelFits;

namespace FitSpec.Tests.Cli;

/// <summary>
/// Cancelling a run: Ctrl-C on `fitspec solve` (a real SIGINT to a real process), and a cancelled token on a
/// batch. Fits that finished keep their files, the stopped ones get none (no temp files either), the cache
/// records nothing for them, and the run ends within seconds instead of the slow fit's 40.
/// </summary>
public sealed class CancelTests
{
    /// <summary>
    /// An earlier run writes a quick fit; then `fitspec solve` on the slow fit gets SIGINT after 1.5 s. It
    /// exits 130 soon after, says the slow fit was cancelled, and the out folder is byte for byte as the
    /// earlier run left it: no slow.* files, no temp files, no new cache entry, the index pages untouched.
    /// </summary>
    [Fact]
    public void Ctrl_c_stops_the_running_fit_writes_nothing_for_it_and_exits_130()
    {
        using var cli = new CliHarness();
        cli.Write("quick.csv", QuickCsv);
        cli.Write("quick.fit.yaml", QuickSpec("quick"));
        cli.Write("slow.csv", SlowCsv());
        cli.Write("slow.fit.yaml", SlowSpec());
        var outDir = Path.Combine(cli.Folder, "out");
        var earlier = cli.Run("solve", "quick.fit.yaml", "--out", "out");
        Assert.True(earlier.ExitCode == 0, earlier.ToString());
        var before = Snapshot(outDir);

        var (run, afterSignal) = RunAndInterrupt(cli.Folder, TimeSpan.FromSeconds(1.5), "solve", "slow.fit.yaml", "--out", "out");

        Assert.True(run.ExitCode == 130, run.ToString());
        Assert.True(afterSignal < TimeSpan.FromSeconds(5), $"exited {afterSignal.TotalSeconds:F1} s after SIGINT");
        Assert.Contains("fitspec: cancelling: stopping the fits under way", run.Stderr, StringComparison.Ordinal);
        Assert.Contains("slow: cancelled: stopped while it ran; nothing was written for it", run.Stderr, StringComparison.Ordinal);
        Assert.Contains("[1/1] slow: cancelled (not finished)", run.Stdout, StringComparison.Ordinal);
        Assert.StartsWith("total: 1 fit (0 solved, 0 cached, 1 cancelled)", LastLine(run), StringComparison.Ordinal);
        Assert.EndsWith("exit 130", LastLine(run), StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", run.Stderr, StringComparison.Ordinal);
        Assert.Empty(TempFiles(outDir));
        Assert.DoesNotContain(Directory.GetFiles(outDir), f => Path.GetFileName(f).StartsWith("slow.", StringComparison.Ordinal));
        AssertSameFiles(before, Snapshot(outDir), compareTimes: true);
    }

    /// <summary>
    /// In one batch (one fit at a time): a cached fit, the slow fit, and a quick fit after it. The token is
    /// cancelled from the slow fit's first progress report, so HiGHS is surely running: the batch returns
    /// promptly with the cached fit as it was, the slow one stopped and the last one never started — both
    /// cancelled, nothing written or cached for them.
    /// </summary>
    [Fact]
    public void A_cancelled_batch_marks_the_stopped_and_unstarted_fits_and_records_nothing_for_them()
    {
        using var temp = new Support.TempFolder("fitspec-cancel");
        var first = Write(temp.Path, "first", QuickSpec("first"), QuickCsv);
        var slow = Write(temp.Path, "slow", SlowSpec(), SlowCsv());
        var last = Write(temp.Path, "last", QuickSpec("last"), QuickCsv);
        var outDir = Path.Combine(temp.Path, "out");
        var earlier = BatchRunner.Run(new BatchRequest([first], outDir, [], 1, false, RunSettings.Default));
        Assert.Equal(FitSource.Solved, Assert.Single(earlier).Source);
        var before = Snapshot(outDir);

        using var cancel = new CancellationTokenSource();
        var reports = new ConcurrentQueue<(string Name, SolveProgress Progress)>();
        var cancelledAt = TimeSpan.Zero;
        var clock = Stopwatch.StartNew();
        var runs = BatchRunner.Run(
            new BatchRequest([first, slow, last], outDir, [], 1, false, RunSettings.Default),
            cancellation: cancel.Token,
            solving: (name, progress) =>
            {
                reports.Enqueue((name, progress));
                cancelledAt = clock.Elapsed;
                cancel.Cancel();
            });
        var stoppedAfter = clock.Elapsed - cancelledAt;

        Assert.NotEmpty(reports);
        Assert.All(reports, r => Assert.Equal("slow", r.Name));
        Assert.InRange(reports.First().Progress.Elapsed.TotalSeconds, SolveProgress.QuietSeconds, SolveProgress.QuietSeconds + 1);
        Assert.True(stoppedAfter < TimeSpan.FromSeconds(3), $"the batch returned {stoppedAfter.TotalSeconds:F1} s after the cancel");
        Assert.Equal(["first", "slow", "last"], runs.Select(r => r.Summary.Name));
        Assert.Equal(FitSource.Cached, runs[0].Source);
        Assert.All(runs.Skip(1), r =>
        {
            Assert.Equal(FitSource.Cancelled, r.Source);
            Assert.Equal("cancelled", r.Summary.Status);
            Assert.Equal(130, r.ExitCode);
            Assert.Empty(r.Outputs);
            Assert.Empty(r.Problems);
        });
        Assert.Equal("stopped while it ran; nothing was written for it", runs[1].Summary.StatusDetail);
        Assert.Equal("not started; nothing was written for it", runs[2].Summary.StatusDetail);
        Assert.Empty(TempFiles(outDir));
        AssertSameFiles(before, Snapshot(outDir), compareTimes: true);

        // Nothing was recorded for them: the next run solves both (and finds the first fit cached still).
        var again = BatchRunner.Run(new BatchRequest([first, last], outDir, [], 1, false, RunSettings.Default));
        Assert.Equal([FitSource.Cached, FitSource.Solved], again.Select(r => r.Source));
    }

    /// <summary>Runs the CLI, sends SIGINT after <paramref name="delay"/>, and returns the run and how long it took to end after the signal.</summary>
    private static (CliRun Run, TimeSpan AfterSignal) RunAndInterrupt(string folder, TimeSpan delay, params string[] args)
    {
        // A process started with SIGINT ignored (as a shell does for background jobs) keeps ignoring it, which
        // is right for fitspec but would defeat the test: GNU env puts the default disposition back first.
        var info = new ProcessStartInfo("env")
        {
            WorkingDirectory = folder,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add("--default-signal=INT");
        info.ArgumentList.Add(DotnetHost());
        info.ArgumentList.Add(CliHarness.FitspecDll);
        foreach (var a in args)
        {
            info.ArgumentList.Add(a);
        }

        using var process = Process.Start(info) ?? throw new InvalidOperationException("could not start fitspec");
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        Thread.Sleep(delay);
        if (process.HasExited)
        {
            Assert.Fail($"fitspec ended before the signal (exit {process.ExitCode}): {stdout.Result}{stderr.Result}");
        }

        using (var kill = Process.Start("kill", ["-INT", process.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)]))
        {
            kill.WaitForExit();
        }

        var signalled = Stopwatch.StartNew();
        if (!process.WaitForExit(20_000))
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException("fitspec did not end within 20 s of SIGINT");
        }

        process.WaitForExit();
        return (new CliRun(process.ExitCode, stdout.Result, stderr.Result), signalled.Elapsed);
    }

    private static string LastLine(CliRun run) => run.Stdout.TrimEnd().Split('\n')[^1].Trim();

    private static void AssertSameFiles(Dictionary<string, (byte[] Bytes, DateTime Written)> before, Dictionary<string, (byte[] Bytes, DateTime Written)> after, bool compareTimes)
    {
        Assert.Equal(before.Keys.Order(StringComparer.Ordinal), after.Keys.Order(StringComparer.Ordinal));
        foreach (var (path, (bytes, written)) in before)
        {
            Assert.True(bytes.AsSpan().SequenceEqual(after[path].Bytes), $"{path} changed");
            if (compareTimes)
            {
                Assert.Equal(written, after[path].Written);
            }
        }
    }

    private static string DotnetHost()
    {
        var host = Environment.GetEnvironmentVariable("DOTNET_HOST_PATH");
        if (!string.IsNullOrEmpty(host) && File.Exists(host))
        {
            return host;
        }

        var self = Environment.ProcessPath;
        return self is not null && Path.GetFileNameWithoutExtension(self) == "dotnet" ? self : "dotnet";
    }
}
