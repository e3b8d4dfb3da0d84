using FitSpec.Tests.Cli;
using static FitSpec.Tests.Cli.BatchSpecs;

namespace FitSpec.Tests.Faults;

/// <summary>
/// An out folder that cannot be written, made so that root (as the tests run) cannot write it either: a
/// read-only file system, the immutable attribute, a path through a regular file. The run checks the folder
/// before it solves anything: it ends with one line naming the out folder and why, exit 2, and the folder is
/// exactly as it was: no file changed, none added, no temp file. A folder that takes new files but not some
/// fit's (those files made immutable) is reported per fit, and that fit keeps its earlier cache entry.
/// </summary>
public sealed class ReadOnlyOutTests
{
    private static readonly string[] ChangedFits = [Name(1), Name(4)];

    [MountFact]
    public void A_read_only_file_system_under_the_out_folder_ends_the_run_in_one_line_and_nothing_changes()
    {
        using var cli = new CliHarness();
        var outDir = Path.Combine(cli.Folder, "out");
        using var mount = new TmpfsMount(outDir, "2m");
        var (run, before) = RunAfterEarlierRun(cli, outDir, mount.RemountReadOnly);
        WriteRefusal.AssertOutFolderRefused(run, "out", "the file system is read-only");
        AssertUnchanged(outDir, before);
    }

    /// <summary>The out folder and its cache folder immutable: what a read-only folder tree is to a user other than root.</summary>
    [ImmutableFact]
    public void An_immutable_out_folder_ends_the_run_in_one_line_and_nothing_changes()
    {
        using var cli = new CliHarness();
        var outDir = Path.Combine(cli.Folder, "out");
        ImmutableFolder? immutable = null;
        try
        {
            var (run, before) = RunAfterEarlierRun(cli, outDir, () => immutable = new ImmutableFolder(outDir, withSubfolders: true));
            WriteRefusal.AssertOutFolderRefused(run, "out", "permission denied");
            AssertUnchanged(outDir, before);
        }
        finally
        {
            immutable?.Dispose();
        }
    }

    /// <summary>
    /// Only one changed fit's files cannot be replaced (the folder and cache take new files): that fit is
    /// reported, its temps removed, its earlier files and cache entry kept, so putting its data back is a cache
    /// hit; the other changed fit is written as usual.
    /// </summary>
    [ImmutableFact]
    public void A_fit_whose_files_could_not_be_written_keeps_its_earlier_files_and_cache_entry()
    {
        using var cli = new CliHarness();
        var outDir = Path.Combine(cli.Folder, "out");
        var stuck = Name(1);
        ImmutableFolder? immutable = null;
        try
        {
            var (run, all) = RunAfterEarlierRun(cli, outDir, () => immutable = new ImmutableFolder(Directory.EnumerateFiles(outDir, stuck + ".*").ToList()));
            var before = all.Where(f => f.Key.StartsWith(stuck + ".", StringComparison.Ordinal)).ToList();
            Assert.NotEmpty(before);

            WriteRefusal.AssertReported(run, "out", [stuck], indexRefused: false);
            var line = run.StderrLines.Single();
            Assert.Contains($"out/{stuck}.", line, StringComparison.Ordinal);
            Assert.Contains("permission denied", line, StringComparison.Ordinal);
            Assert.DoesNotContain(".tmp", line, StringComparison.Ordinal);
            Assert.Empty(OutFolder.TempFiles(outDir));
            var after = Snapshot(outDir);
            Assert.All(before, f => Assert.True(f.Value.Bytes.AsSpan().SequenceEqual(after[f.Key].Bytes), $"{f.Key} changed"));

            cli.Write($"specs/{stuck}.csv", DataCsv(1));
            var again = cli.Run("solve", "specs", "--out", "out", "--jobs", "2");
            Assert.True(again.ExitCode == 0, again.ToString());
            Assert.Contains(stuck, Cached(again));
        }
        finally
        {
            immutable?.Dispose();
        }
    }

    /// <summary>`--out notes.txt/out`: the folder cannot be made (ENOTDIR); one line says so, nothing is made.</summary>
    [Fact]
    public void An_out_folder_under_a_regular_file_ends_the_run_in_one_line_and_nothing_is_made()
    {
        using var cli = new CliHarness();
        WriteBatch(cli, 4);
        cli.Write("notes.txt", "not a folder\n");

        var run = cli.Run("solve", "specs", "--out", "notes.txt/out", "--jobs", "2");

        WriteRefusal.AssertOutFolderRefused(run, "notes.txt/out", "a part of the path is a file, not a folder");
        Assert.DoesNotContain("Could not find", run.Stderr, StringComparison.Ordinal);
        Assert.Equal("not a folder\n", cli.Read("notes.txt"));
        Assert.Equal(["notes.txt", "specs"], Directory.EnumerateFileSystemEntries(cli.Folder).Select(Path.GetFileName).Order(StringComparer.Ordinal));
    }

    // A first run writes six fits; two are changed and the folder (or part of it) is made unwritable; the
    // second run is returned with the folder as it was before it.
    private static (CliRun Run, Dictionary<string, (byte[] Bytes, DateTime Written)> Before) RunAfterEarlierRun(CliHarness cli, string outDir, Action makeReadOnly)
    {
        var names = WriteBatch(cli, 6);
        var first = cli.Run("solve", "specs", "--out", "out", "--jobs", "2");
        Assert.True(first.ExitCode == 0, first.ToString());
        foreach (var name in ChangedFits)
        {
            cli.Write($"specs/{name}.csv", DataCsv(names.ToList().IndexOf(name), shift: 0.5));
        }

        var before = Snapshot(outDir);
        makeReadOnly();

        return (cli.Run("solve", "specs", "--out", "out", "--jobs", "2"), before);
    }

    // Same files, same bytes, same times: nothing added, rewritten or touched.
    private static void AssertUnchanged(string outDir, Dictionary<string, (byte[] Bytes, DateTime Written)> before)
    {
        var after = Snapshot(outDir);
        Assert.Equal(before.Keys.Order(StringComparer.Ordinal), after.Keys.Order(StringComparer.Ordinal));
        Assert.All(before, f =>
        {
            Assert.True(f.Value.Bytes.AsSpan().SequenceEqual(after[f.Key].Bytes), $"{f.Key} changed");
            Assert.Equal(f.Value.Written, after[f.Key].Written);
        });
    }
}
