using FitSpec.Tests.Cli;
using static FitSpec.Tests.Cli.BatchSpecs;

namespace FitSpec.Tests.Faults;

/// <summary>
/// An out folder on a full file system (ENOSPC), on a small tmpfs filled up by a filler file beside the out
/// folder. The fits still run; each that cannot be written gets one error line, the run exits 2, no temp
/// file is left and no final-named file is cut short; once there is room again the next run writes what the
/// full one could not, and ends with the files a clean run writes.
/// </summary>
public sealed class FullOutTests
{
    private const string Out = "vol/out";
    private static readonly string[] Solve = ["solve", "specs", "--out", Out, "--jobs", "2"];
    private static readonly string[] ChangedFits = [Name(1), Name(4)];

    [MountFact]
    public void A_full_file_system_is_reported_per_fit_leaves_earlier_files_whole_and_a_later_run_catches_up()
    {
        using var cli = new CliHarness();
        var names = WriteBatch(cli, 6);
        var outDir = Path.Combine(cli.Folder, Out);
        using var volume = new TmpfsMount(Path.Combine(cli.Folder, "vol"), "2m");
        var first = cli.Run(Solve);
        Assert.True(first.ExitCode == 0, first.ToString());
        ChangeData(cli, names);
        var before = OutFolder.Reports(outDir);
        var filler = Path.Combine(volume.Path, "filler");
        FillerFile.Fill(filler);
        Assert.True(volume.FreeBytes == 0, $"{volume.FreeBytes} bytes still free");

        var full = cli.Run(Solve);

        // Whether the index pages fit depends on what pruning the changed fits' old cache entries freed.
        WriteRefusal.AssertReported(full, Out, ChangedFits, indexRefused: null);
        Assert.Equal(names.Except(ChangedFits).Order(StringComparer.Ordinal), Cached(full).Order(StringComparer.Ordinal));
        Assert.Empty(OutFolder.TempFiles(outDir));
        OutFolder.AssertComplete(outDir);
        var after = OutFolder.Reports(outDir);
        Assert.Equal(before.Keys.Order(StringComparer.Ordinal), after.Keys.Order(StringComparer.Ordinal));
        Assert.All(before.Where(f => !IsIndex(f.Key)), f => Assert.True(f.Value.AsSpan().SequenceEqual(after[f.Key]), $"{f.Key} changed"));

        File.Delete(filler);
        var later = cli.Run(Solve);

        Assert.True(later.ExitCode == 0, later.ToString());
        Assert.Equal(names.Except(ChangedFits).Order(StringComparer.Ordinal), Cached(later).Order(StringComparer.Ordinal));
        var clean = CleanRun();
        var final = OutFolder.Reports(outDir);
        Assert.Equal(clean.Keys.Order(StringComparer.Ordinal), final.Keys.Order(StringComparer.Ordinal));
        Assert.All(clean, f => Assert.True(f.Value.AsSpan().SequenceEqual(final[f.Key]), $"{f.Key} differs from a clean run's"));
    }

    /// <summary>
    /// A new fit into a folder with room for its HTML, Markdown and JSON but not its plots: none of its files
    /// may be left under a final name (a Markdown report linking plots that are not there) while the run says
    /// "files NOT written"; the error names a final file, not a temp, and says the device is full.
    /// </summary>
    [MountFact]
    public void A_fit_that_runs_out_of_room_part_way_leaves_none_of_its_files()
    {
        using var cli = new CliHarness();
        WriteBatch(cli, 1);
        var sizes = CleanRun(1).Where(f => f.Key.StartsWith(Name(0) + ".", StringComparison.Ordinal) && !f.Key.EndsWith(".svg", StringComparison.Ordinal))
            .Sum(f => Pages(f.Value.Length));
        var outDir = Path.Combine(cli.Folder, Out);
        using var volume = new TmpfsMount(Path.Combine(cli.Folder, "vol"), "1m");
        Directory.CreateDirectory(outDir);
        // Room for the reports and one page more: the first plot (over 4 KiB) is the write that fails.
        FillerFile.Fill(Path.Combine(volume.Path, "filler"), leaveFree: sizes + 4096);

        var run = cli.Run(Solve);

        WriteRefusal.AssertReported(run, Out, [Name(0)], indexRefused: null);
        var line = run.StderrLines.First(l => l.Contains($"'{Name(0)}'", StringComparison.Ordinal));
        Assert.Contains($"{Out}/{Name(0)}.", line, StringComparison.Ordinal);
        Assert.Contains("no space left on the device", line, StringComparison.Ordinal);
        Assert.DoesNotContain(".tmp", line, StringComparison.Ordinal);
        Assert.Empty(OutFolder.TempFiles(outDir));
        Assert.DoesNotContain(OutFolder.Reports(outDir).Keys, f => f.StartsWith(Name(0) + ".", StringComparison.Ordinal));
    }

    private static void ChangeData(CliHarness cli, IReadOnlyList<string> names)
    {
        foreach (var name in ChangedFits)
        {
            cli.Write($"specs/{name}.csv", DataCsv(names.ToList().IndexOf(name), shift: 0.5));
        }
    }

    private static bool IsIndex(string path) => Path.GetFileName(path).StartsWith(FitSpec.Pipeline.Batch.BatchRunner.IndexName + ".", StringComparison.Ordinal);

    private static long Pages(long bytes) => (bytes + 4095) / 4096 * 4096;

    /// <summary>The reports a clean run of the final specs writes into a fresh, roomy folder.</summary>
    private static Dictionary<string, byte[]> CleanRun(int count = 6)
    {
        using var fresh = new CliHarness();
        var names = WriteBatch(fresh, count);
        if (count == 6)
        {
            ChangeData(fresh, names);
        }

        var run = fresh.Run(Solve);
        Assert.True(run.ExitCode == 0, run.ToString());
        return OutFolder.Reports(Path.Combine(fresh.Folder, Out));
    }
}
