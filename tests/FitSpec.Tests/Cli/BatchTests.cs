using System.Text.Json;
using static FitSpec.Tests.Cli.BatchSpecs;

namespace FitSpec.Tests.Cli;

/// <summary>`fitspec solve` over a batch, run as a process: failures stay local, exit code, progress lines, the cache.</summary>
public sealed class BatchTests
{
    /// <summary>
    /// 28 good fits, one spec that does not parse and one whose acceptance fails: every fit is run and reported,
    /// the exit code is the worst (2). A second run takes everything from the cache and leaves the out folder
    /// exactly as it was; changing one data file, deleting one output, or --force re-solve just what they should.
    /// </summary>
    [Fact]
    public void A_batch_runs_past_its_failures_and_then_reuses_what_did_not_change()
    {
        using var cli = new CliHarness();
        var names = WriteBatch(cli, 28).ToList();
        cli.Write("specs/broken.fit.yaml", Unparseable);
        cli.Write("specs/strict.csv", DataCsv(3));
        cli.Write("specs/strict.fit.yaml", SpecYaml(3, FailingAcceptance).Replace(Name(3), "strict", StringComparison.Ordinal));
        var all = names.Append("broken").Append("strict").ToHashSet(StringComparer.Ordinal);
        var outDir = Path.Combine(cli.Folder, "out");

        var first = cli.Run("solve", "specs", "--out", "out");
        Assert.True(first.ExitCode == 2, first.ToString());
        var lines = ProgressLines(first);
        AssertNames(all, lines.Keys);
        Assert.Equal(Enumerable.Range(1, 30), lines.Values.Select(m => int.Parse(m.Groups["done"].Value, System.Globalization.CultureInfo.InvariantCulture)).Order());
        Assert.All(lines.Values, m => Assert.Equal("30", m.Groups["total"].Value));
        Assert.Empty(Cached(first));
        Assert.DoesNotContain('\u001b', first.Stdout); // plain text when redirected: no terminal control codes
        foreach (var name in names)
        {
            Assert.Equal("optimal", lines[name].Groups["status"].Value);
            Assert.Equal("optimal", cli.Json($"out/{name}.result.json").GetProperty("status").GetString());
        }

        Assert.Equal("error", lines["broken"].Groups["status"].Value);
        Assert.Contains("specs/broken.fit.yaml:2:", first.Stderr, StringComparison.Ordinal);
        Assert.Contains("FAILED", lines["strict"].Groups["rest"].Value, StringComparison.Ordinal);
        Assert.Contains(cli.Json("out/strict.result.json").GetProperty("acceptance").EnumerateArray(), a => a.GetProperty("passed").ValueKind == JsonValueKind.False);
        Assert.StartsWith("total: 30 fits (30 solved, 0 cached): 28 passed, 1 failed acceptance, 0 no optimum, 1 error; exit 2", LastLine(first), StringComparison.Ordinal);
        AssertSummaryTable(first, ["broken", .. names, "strict"]);

        var before = Snapshot(outDir);
        var second = cli.Run("solve", "specs", "--out", "out");
        Assert.True(second.ExitCode == 2, second.ToString());
        AssertNames(all, Cached(second));
        Assert.Contains("specs/broken.fit.yaml:2:", second.Stderr, StringComparison.Ordinal);
        Assert.Contains("FAILED", ProgressLines(second)["strict"].Groups["rest"].Value, StringComparison.Ordinal);
        Assert.StartsWith("total: 30 fits (0 solved, 30 cached)", LastLine(second), StringComparison.Ordinal);
        AssertSameFiles(before, Snapshot(outDir), compareTimes: true);

        var oldJson = cli.Read("out/fit07.result.json");
        cli.Write("specs/fit07.csv", DataCsv(7, shift: 0.5));
        var third = cli.Run("solve", "specs", "--out", "out");
        Assert.True(third.ExitCode == 2, third.ToString());
        AssertNames(all.Except(["fit07"]), Cached(third));
        Assert.NotEqual(oldJson, cli.Read("out/fit07.result.json"));

        File.Delete(Path.Combine(outDir, "fit12.md"));
        var fourth = cli.Run("solve", "specs", "--out", "out");
        AssertNames(all.Except(["fit12"]), Cached(fourth));
        Assert.True(cli.Exists("out/fit12.md"), "the deleted report is written again");

        var forced = cli.Run("solve", "specs", "--out", "out", "--force");
        Assert.True(forced.ExitCode == 2, forced.ToString());
        Assert.Empty(Cached(forced));
        AssertNames(all, ProgressLines(forced).Keys);
    }

    /// <summary>A fit whose files cannot be written fails alone (exit 2) and is not cached; the others are written.</summary>
    [Fact]
    public void A_fit_that_cannot_be_written_fails_alone_and_is_tried_again_next_time()
    {
        using var cli = new CliHarness();
        WriteBatch(cli, 3);
        Directory.CreateDirectory(Path.Combine(cli.Folder, "out", "fit01.html")); // a folder where the report must go

        var first = cli.Run("solve", "specs", "--out", "out");
        Assert.True(first.ExitCode == 2, first.ToString());
        Assert.Contains("cannot write the results of 'fit01'", first.Stderr, StringComparison.Ordinal);
        Assert.True(cli.Exists("out/fit00.result.json") && cli.Exists("out/fit02.result.json"), first.ToString());
        Assert.DoesNotContain("href=\"fit01.html\"", cli.Read("out/index.html"), StringComparison.Ordinal);

        var second = cli.Run("solve", "specs", "--out", "out");
        Assert.True(second.ExitCode == 2, second.ToString());
        Assert.Equal(["fit00", "fit02"], Cached(second).Order(StringComparer.Ordinal));
    }

    /// <summary>--jobs changes nothing in the files: one worker and eight write the same bytes, run after run.</summary>
    [Fact]
    public void Jobs_1_and_jobs_8_write_byte_identical_files_across_repeated_runs()
    {
        using var cli = new CliHarness();
        WriteBatch(cli, 16);
        var outDir = Path.Combine(cli.Folder, "out");
        var one = cli.Run("solve", "specs", "--out", "out", "--jobs", "1");
        Assert.True(one.ExitCode == 0, one.ToString());
        var serial = Snapshot(outDir);
        for (var repeat = 0; repeat < 2; repeat++)
        {
            var eight = cli.Run("solve", "specs", "--out", "out", "--jobs", "8", "--force");
            Assert.True(eight.ExitCode == 0, eight.ToString());
            Assert.Empty(Cached(eight));
            AssertSameFiles(serial, Snapshot(outDir), compareTimes: false);
        }

        Assert.Equal("fitspec solve specs --out out", cli.Json("out/fit05.result.json").GetProperty("provenance").GetProperty("command_line").GetString());
    }

    /// <summary>--stamp puts the time in the outputs and is part of the cache key; it is recorded, --jobs is not.</summary>
    [Fact]
    public void Stamp_marks_the_outputs_and_a_run_without_it_solves_again()
    {
        using var cli = new CliHarness();
        WriteBatch(cli, 1);
        var stamped = cli.Run("solve", "specs", "--out", "out", "--stamp", "--jobs", "2");
        Assert.True(stamped.ExitCode == 0, stamped.ToString());
        var provenance = cli.Json("out/fit00.result.json").GetProperty("provenance");
        Assert.Equal(JsonValueKind.String, provenance.GetProperty("stamp").ValueKind);
        Assert.Equal("fitspec solve specs --out out --stamp", provenance.GetProperty("command_line").GetString());

        var plain = cli.Run("solve", "specs", "--out", "out");
        Assert.Empty(Cached(plain));
        Assert.NotEqual(JsonValueKind.String, cli.Json("out/fit00.result.json").GetProperty("provenance").TryGetProperty("stamp", out var s) ? s.ValueKind : JsonValueKind.Undefined);
        Assert.Equal(["fit00"], Cached(cli.Run("solve", "specs", "--out", "out")));
    }

    /// <summary>A cache entry that is not valid JSON, or not a complete entry, is a miss, never a crash.</summary>
    [Fact]
    public void A_corrupt_cache_entry_is_a_miss()
    {
        using var cli = new CliHarness();
        WriteBatch(cli, 2);
        Assert.Equal(0, cli.Run("solve", "specs", "--out", "out").ExitCode);
        var entries = Directory.GetFiles(Path.Combine(cli.Folder, "out", ".fitspec-cache"), "*.json").Order(StringComparer.Ordinal).ToArray();
        Assert.Equal(2, entries.Length);
        File.WriteAllText(entries[0], "{\"format\": \"fitspec-cache-entry/1\", \"key\": ");
        File.WriteAllText(entries[1], "{\"format\": \"fitspec-cache-entry/1\", \"summary\": null, \"outputs\": [{\"path\": \"../../etc/passwd\"}]}");

        var run = cli.Run("solve", "specs", "--out", "out");
        Assert.True(run.ExitCode == 0, run.ToString());
        Assert.Empty(Cached(run));
        Assert.Equal(["fit00", "fit01"], Cached(cli.Run("solve", "specs", "--out", "out")).Order(StringComparer.Ordinal));
    }

    /// <summary>Two runs of one batch into one folder at the same time both finish; every file is complete after.</summary>
    [Fact]
    public async Task Two_runs_into_one_folder_at_once_leave_complete_files()
    {
        using var cli = new CliHarness();
        var names = WriteBatch(cli, 10);
        var runs = await Task.WhenAll(
            Task.Run(() => cli.Run("solve", "specs", "--out", "out")),
            Task.Run(() => cli.Run("solve", "specs", "--out", "out")));
        Assert.All(runs, r => Assert.True(r.ExitCode == 0, r.ToString()));

        var outDir = Path.Combine(cli.Folder, "out");
        Assert.DoesNotContain(Directory.EnumerateFiles(outDir, "*", SearchOption.AllDirectories), f => f.EndsWith(".tmp", StringComparison.Ordinal));
        foreach (var name in names)
        {
            Assert.Equal("optimal", cli.Json($"out/{name}.result.json").GetProperty("status").GetString());
        }

        foreach (var entry in Directory.GetFiles(Path.Combine(outDir, ".fitspec-cache")))
        {
            JsonDocument.Parse(File.ReadAllText(entry)).Dispose();
        }

        // Whatever the interleaving, the folder settles: after one more run everything is cached.
        Assert.Equal(0, cli.Run("solve", "specs", "--out", "out").ExitCode);
        AssertNames(names, Cached(cli.Run("solve", "specs", "--out", "out")));
    }

    [Fact]
    public void A_fit_named_index_is_refused_because_the_index_pages_take_that_name()
    {
        using var cli = new CliHarness();
        WriteBatch(cli, 1);
        cli.Write("specs/index.csv", DataCsv(1));
        cli.Write("specs/index.fit.yaml", SpecYaml(1).Replace(Name(1), "index", StringComparison.Ordinal));
        var run = cli.Run("solve", "specs", "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        Assert.Contains("index pages", run.Stderr, StringComparison.Ordinal);
        Assert.Contains("fit00", cli.Read("out/index.md"), StringComparison.Ordinal);
        Assert.False(cli.Exists("out/index.result.json"));
    }

    private static void AssertNames(IEnumerable<string> expected, IEnumerable<string> actual) =>
        Assert.Equal(expected.Order(StringComparer.Ordinal), actual.Order(StringComparer.Ordinal));

    private static string LastLine(CliRun run) => run.Stdout.TrimEnd().Split('\n')[^1].Trim();

    // The table after the progress lines: a header, then one row per fit in the order of the spec paths.
    private static void AssertSummaryTable(CliRun run, IReadOnlyList<string> namesInPathOrder)
    {
        var lines = run.Stdout.Split('\n', StringSplitOptions.TrimEntries);
        var header = Array.FindIndex(lines, l => l.StartsWith("fit ", StringComparison.Ordinal) && l.Contains("status", StringComparison.Ordinal));
        Assert.True(header >= 0, run.ToString());
        var rows = lines.Skip(header + 1).Take(namesInPathOrder.Count).Select(l => l.Split(' ')[0]).ToList();
        Assert.Equal(namesInPathOrder.Order(StringComparer.Ordinal), rows);
    }

    // Reports still print the solve time, which differs run to run (until the runner leaves it out unless
    // --stamp); so that line, and the cache entries' hashes of the reports, are left out of the comparison.
    private static string Comparable(string path, byte[] bytes)
    {
        var text = System.Text.Encoding.UTF8.GetString(bytes);
        var skip = path.EndsWith(".md", StringComparison.Ordinal) || path.EndsWith(".html", StringComparison.Ordinal) ? "Solve time"
            : path.Contains(".fitspec-cache", StringComparison.Ordinal) ? "\"sha256\""
            : null;
        return skip is null ? text : string.Join('\n', text.Split('\n').Where(l => !l.Contains(skip, StringComparison.Ordinal)));
    }

    private static void AssertSameFiles(Dictionary<string, (byte[] Bytes, DateTime Written)> expected, Dictionary<string, (byte[] Bytes, DateTime Written)> actual, bool compareTimes)
    {
        Assert.Equal(expected.Keys.Order(StringComparer.Ordinal), actual.Keys.Order(StringComparer.Ordinal));
        foreach (var (path, (bytes, written)) in expected)
        {
            if (compareTimes)
            {
                Assert.True(bytes.AsSpan().SequenceEqual(actual[path].Bytes), $"{path} was changed");
                Assert.True(written == actual[path].Written, $"{path} was rewritten");
            }
            else
            {
                Assert.True(Comparable(path, bytes) == Comparable(path, actual[path].Bytes), $"{path} differs");
            }
        }
    }
}
