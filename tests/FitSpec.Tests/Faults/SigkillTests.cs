using FitSpec.Pipeline.Batch;
using FitSpec.Tests.Cli;
using Xunit.Abstractions;
using static FitSpec.Tests.Cli.BatchSpecs;

namespace FitSpec.Tests.Faults;

/// <summary>
/// `fitspec solve` killed with SIGKILL in the middle of a batch that rewrites earlier reports: no handler
/// runs, so whatever the folder holds then is what the atomic writes guarantee on their own. A temp file the
/// kill caught between create and rename is accepted here: it never has a final name and nothing reads it.
/// That such files are never removed afterwards is a bug of its own (see <see cref="StaleTempTests"/>).
/// </summary>
public sealed class SigkillTests(ITestOutputHelper output)
{
    private static readonly string[] Solve = ["solve", "specs", "--out", "out", "--jobs", "2"];

    /// <summary>
    /// A first run writes the whole batch; the second, with some fits changed, is killed once three fits have
    /// been solved and written (the slow fit, 41 s, cannot have finished by then; others are under way or not
    /// started). Every final-named file is then complete and either the first run's or the new version, the
    /// untouched fits' files and the index pages are byte for byte (and time) as before, every cache entry is
    /// whole, and temp files, if any, are only the killed process's. A third run takes every fit that is
    /// unchanged or was finished from the cache, solves only the rest, and ends with exactly the files a
    /// clean run of the same specs writes in a fresh folder.
    /// </summary>
    [Fact]
    public async Task A_batch_killed_mid_run_leaves_only_whole_files_and_the_next_run_completes_it_as_a_clean_run_would()
    {
        using var cli = new CliHarness();
        var outDir = Path.Combine(cli.Folder, "out");
        // The clean run in a fresh folder is independent: it runs while this folder's runs do.
        var clean = Task.Run(CleanRun);
        KillBatch.WriteFirst(cli);
        var first = cli.Run(Solve);
        Assert.True(first.ExitCode == 0, first.ToString());
        var before = Snapshot(outDir);
        KillBatch.WriteChanges(cli);

        var killed = KilledRun.Start(cli.Folder, lines => SolvedLines(lines) >= 3, Solve);

        Assert.True(killed.ExitCode == KilledRun.SigkillExitCode, "not killed: " + killed);
        var finished = ProgressLines(new CliRun(killed.ExitCode, killed.Stdout, killed.Stderr)).Keys.ToHashSet(StringComparer.Ordinal);
        Assert.DoesNotContain(KillBatch.Slow, finished);
        Assert.True(finished.Count < KillBatch.All.Count, killed.ToString());
        var temps = OutFolder.TempFiles(outDir);
        output.WriteLine($"killed after {finished.Count} of {KillBatch.All.Count} fits; temp files left: {temps.Count} {string.Join(' ', temps)}");
        OutFolder.AssertComplete(outDir);
        OutFolder.AssertTempFilesOnlyFrom(outDir, killed.Pid);

        var cleanReports = await clean;
        var reports = OutFolder.Reports(outDir);
        Assert.Equal(before.Keys.Where(k => !k.StartsWith(FitCache.FolderName, StringComparison.Ordinal)).Order(StringComparer.Ordinal), reports.Keys.Order(StringComparer.Ordinal));
        foreach (var (path, bytes) in reports)
        {
            var old = bytes.AsSpan().SequenceEqual(before[path].Bytes);
            var renewed = cleanReports.TryGetValue(path, out var fresh) && bytes.AsSpan().SequenceEqual(fresh);
            Assert.True(old || renewed, $"{path} is neither the first run's version nor the new one");
            if (IsUntouched(path))
            {
                Assert.True(old, $"{path} belongs to a fit the killed run did not rewrite, yet it changed");
                Assert.Equal(before[path].Written, File.GetLastWriteTimeUtc(Path.Combine(outDir, path)));
            }
        }

        KillBatch.RevertSlow(cli);
        var third = cli.Run(Solve);

        Assert.True(third.ExitCode == 0, third.ToString());
        var lines = ProgressLines(third);
        Assert.Equal(KillBatch.All.Order(StringComparer.Ordinal), lines.Keys.Order(StringComparer.Ordinal));
        var cached = Cached(third);
        var solved = KillBatch.All.Except(cached).ToHashSet(StringComparer.Ordinal);
        Assert.Superset(KillBatch.Unchanged.Concat(finished).ToHashSet(StringComparer.Ordinal), cached);
        Assert.Subset(KillBatch.Changed.ToHashSet(StringComparer.Ordinal), solved);
        Assert.NotEmpty(solved);
        Assert.StartsWith($"total: {KillBatch.All.Count} fits ({solved.Count} solved, {cached.Count} cached)", third.Stdout.TrimEnd().Split('\n')[^1], StringComparison.Ordinal);
        OutFolder.AssertComplete(outDir);
        OutFolder.AssertTempFilesOnlyFrom(outDir, killed.Pid);
        var after = OutFolder.Reports(outDir);
        Assert.Equal(cleanReports.Keys.Order(StringComparer.Ordinal), after.Keys.Order(StringComparer.Ordinal));
        Assert.All(cleanReports, f => Assert.True(f.Value.AsSpan().SequenceEqual(after[f.Key]), $"{f.Key} differs from a clean run's"));
    }

    /// <summary>The reports a clean run of the final specs writes into a fresh folder.</summary>
    private static Dictionary<string, byte[]> CleanRun()
    {
        using var fresh = new CliHarness();
        KillBatch.WriteFirst(fresh);
        KillBatch.WriteChanges(fresh);
        KillBatch.RevertSlow(fresh);
        var run = fresh.Run(Solve);
        Assert.True(run.ExitCode == 0, run.ToString());
        return OutFolder.Reports(Path.Combine(fresh.Folder, "out"));
    }

    // Files of fits the killed run took from the cache or never finished, and the index pages it never reached.
    private static bool IsUntouched(string path)
    {
        var fit = Path.GetFileName(path).Split('.')[0];
        return KillBatch.Unchanged.Contains(fit) || fit == BatchRunner.IndexName;
    }

    private static int SolvedLines(IReadOnlyList<string> lines) =>
        lines.Select(l => ProgressLine().Match(l.Trim())).Count(m => m.Success && m.Groups["seconds"].Success);
}
