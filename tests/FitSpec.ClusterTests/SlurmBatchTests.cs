using System.Diagnostics;
using System.Globalization;
using System.Text.RegularExpressions;
using FitSpec.ClusterTests.Support;
using Xunit.Abstractions;

namespace FitSpec.ClusterTests;

/// <summary>
/// The batch run as a real Slurm job array (4 tasks) plus its dependent merge job, on the local cluster, gives
/// byte for byte the files of one single-process run.
/// </summary>
[Collection(ClusterCollection.Name)]
public sealed partial class SlurmBatchTests(BatchFixture batch, ITestOutputHelper output)
{
    private const int Tasks = 4;

    private static readonly TimeSpan JobLimit = TimeSpan.FromSeconds(240);

    [SlurmFact]
    public async Task Array_job_and_merge_give_the_single_run_files()
    {
        SlurmFactAttribute.Require();
        var reference = await batch.ReferenceAsync();
        Assert.True(reference.ExitCode == 0, "single run: " + reference);

        var work = batch.NewWorkFolder("slurm");
        var clock = Stopwatch.StartNew();
        var submit = await Fitspec.RunAsync(work, "cluster", "slurm", batch.Specs, "--tasks", Tasks.ToString(CultureInfo.InvariantCulture), "--out", "out", "--tool", Fitspec.ToolCommand, "--jobs", "1", "--submit");
        Assert.True(submit.ExitCode == 0, "cluster slurm --submit: " + submit);
        var submitted = Submitted().Match(submit.Stdout);
        Assert.True(submitted.Success, "no line 'submitted array job <ID> (<N> tasks) and merge job <ID>' in: " + submit);
        var (arrayId, mergeId) = (submitted.Groups["array"].Value, submitted.Groups["merge"].Value);
        Assert.Equal(Tasks.ToString(CultureInfo.InvariantCulture), submitted.Groups["tasks"].Value);

        var finished = await SlurmCluster.WaitUntilGoneAsync([arrayId, mergeId], JobLimit);
        var clusterTime = clock.Elapsed;
        if (!finished)
        {
            await SlurmCluster.CancelAsync([arrayId, mergeId]);
            Assert.Fail($"jobs {arrayId} and {mergeId} still queued after {JobLimit.TotalSeconds} s; cancelled");
        }

        var tasks = await SlurmCluster.ShowAsync(arrayId);
        var merge = Assert.Single(await SlurmCluster.ShowAsync(mergeId));
        Report(reference, clusterTime, tasks, merge);

        Assert.Equal(Tasks, tasks.Count);
        Assert.All(tasks, t => Assert.True(t.State == "COMPLETED" && t.ExitCode == "0:0", $"array task {t.ArrayTaskId}: {t.State} exit {t.ExitCode}; log {t.StdOut}"));
        // The merge job runs `fitspec merge`, so its exit code is the merge's.
        Assert.True(merge.State == "COMPLETED" && merge.ExitCode == "0:0", $"merge job: {merge.State} exit {merge.ExitCode}; log {merge.StdOut}: {LogText(merge.StdOut)}");
        Assert.Matches($@"\b{SpecBatch.Size} fits\b", LogText(merge.StdOut));

        var outDir = Path.Combine(work, "out");
        var expected = OutputTree.Read(batch.ReferenceOut);
        OutputTree.AssertIdentical(batch.ReferenceOut, expected, outDir, OutputTree.Read(outDir, ClusterBookkeeping));
        // Jobs write their logs where the scripts say, never the default slurm-<id>.out in the submit folder.
        Assert.Equal(["out"], Directory.EnumerateFileSystemEntries(work).Select(Path.GetFileName));

        // The merge can be run again by hand: the same verdict and the same pages.
        var again = await Fitspec.RunAsync(work, "merge", "out");
        Assert.True(again.ExitCode == 0, "merge again: " + again);
        Assert.Matches($@"\b{SpecBatch.Size} fits\b", again.Stdout);
        OutputTree.AssertIdentical(batch.ReferenceOut, expected, outDir, OutputTree.Read(outDir, ClusterBookkeeping));
    }

    /// <summary>What the cluster run adds for itself: the shard records, the job scripts and the job logs.</summary>
    private static bool ClusterBookkeeping(string relative) =>
        ShardPartitionTests.ShardBookkeeping(relative) || ScriptName().IsMatch(relative);

    private static string LogText(string path) => File.Exists(path) ? File.ReadAllText(path) : $"(no log at {path})";

    private void Report(ProcessRun reference, TimeSpan clusterTime, IReadOnlyList<SlurmJob> tasks, SlurmJob merge)
    {
        output.WriteLine($"single process (--jobs 2): {batch.ReferenceTime.TotalSeconds:F1} s, exit {reference.ExitCode}");
        output.WriteLine($"cluster, {Tasks} array tasks (--jobs 1) + merge, submit to merge done: {clusterTime.TotalSeconds:F1} s");
        foreach (var t in tasks.OrderBy(t => t.ArrayTaskId, StringComparer.Ordinal))
        {
            output.WriteLine($"  task {t.ArrayTaskId}: {t.State} exit {t.ExitCode}, {Seconds(t)} ({t.Start:HH:mm:ss}..{t.End:HH:mm:ss})");
        }

        output.WriteLine($"  merge: {merge.State} exit {merge.ExitCode}, {Seconds(merge)} ({merge.Start:HH:mm:ss}..{merge.End:HH:mm:ss})");
    }

    // Slurm reports start and end to the second.
    private static string Seconds(SlurmJob job) => job.RunTime is { } t ? $"{t.TotalSeconds:F0} s (1 s resolution)" : "time unknown";

    [GeneratedRegex(@"submitted array job (?<array>\d+) \((?<tasks>\d+) tasks\) and merge job (?<merge>\d+)")]
    private static partial Regex Submitted();

    [GeneratedRegex(@"^fitspec-slurm-[^/]*\.sh$")]
    private static partial Regex ScriptName();
}
