using System.ComponentModel;
using System.Diagnostics;
using System.Globalization;

namespace FitSpec.ClusterTests.Support;

/// <summary>One Slurm job (or array task) as `scontrol -o show job` describes it.</summary>
public sealed record SlurmJob(string JobId, string? ArrayTaskId, string State, string ExitCode, DateTime? Start, DateTime? End, string StdOut)
{
    public TimeSpan? RunTime => Start is { } s && End is { } e ? e - s : null;
}

/// <summary>
/// The local Slurm cluster (.ci/slurm/start.sh brings it up): whether it answers, and the few queries the
/// tests wait and check with.
/// </summary>
public static class SlurmCluster
{
    private static readonly Lazy<string?> DownReason = new(Probe);

    /// <summary>Null when `scontrol ping` reaches the controller; otherwise why not.</summary>
    public static string? WhyDown => DownReason.Value;

    /// <summary>CI runs set CI=true; there a missing cluster is a broken CI setup, not a reason to skip.</summary>
    public static bool UnderCi =>
        Environment.GetEnvironmentVariable("CI") is { } ci
        && (ci.Equals("true", StringComparison.OrdinalIgnoreCase) || ci == "1");

    /// <summary>Waits until none of the jobs is in the queue any more; false when the deadline passed first.</summary>
    public static async Task<bool> WaitUntilGoneAsync(IEnumerable<string> jobIds, TimeSpan limit)
    {
        var list = string.Join(',', jobIds);
        var clock = Stopwatch.StartNew();
        while (clock.Elapsed < limit)
        {
            var queue = await Processes.RunAsync("squeue", ["-h", "-j", list, "-o", "%i"], Environment.CurrentDirectory, TimeSpan.FromSeconds(30));
            // squeue reports an error for job ids it no longer knows; with every id gone that also means done.
            if (string.IsNullOrWhiteSpace(queue.Stdout))
            {
                return true;
            }

            await Task.Delay(300);
        }

        return false;
    }

    /// <summary>The job, or each task of an array job.</summary>
    public static async Task<IReadOnlyList<SlurmJob>> ShowAsync(string jobId)
    {
        var run = await Processes.RunAsync("scontrol", ["-o", "show", "job", jobId], Environment.CurrentDirectory, TimeSpan.FromSeconds(30));
        Assert.True(run.ExitCode == 0, $"scontrol -o show job {jobId} failed: {run}");
        return run.Stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(Parse).ToList();
    }

    /// <summary>Cancels jobs left behind by a failed test, so they do not run into the next one.</summary>
    public static async Task CancelAsync(IEnumerable<string> jobIds)
    {
        await Processes.RunAsync("scancel", jobIds, Environment.CurrentDirectory, TimeSpan.FromSeconds(30));
    }

    private static SlurmJob Parse(string line)
    {
        var fields = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var pair in line.Split(' ', StringSplitOptions.RemoveEmptyEntries))
        {
            var eq = pair.IndexOf('=', StringComparison.Ordinal);
            if (eq > 0)
            {
                fields.TryAdd(pair[..eq], pair[(eq + 1)..]);
            }
        }

        string Field(string name) => fields.TryGetValue(name, out var v) ? v : "";
        return new SlurmJob(Field("JobId"), fields.GetValueOrDefault("ArrayTaskId"), Field("JobState"), Field("ExitCode"), Time(Field("StartTime")), Time(Field("EndTime")), Field("StdOut"));
    }

    private static DateTime? Time(string text) =>
        DateTime.TryParseExact(text, "yyyy-MM-dd'T'HH:mm:ss", CultureInfo.InvariantCulture, DateTimeStyles.None, out var t) ? t : null;

    private static string? Probe()
    {
        try
        {
            var ping = Processes.RunAsync("scontrol", ["ping"], Environment.CurrentDirectory, TimeSpan.FromSeconds(20)).GetAwaiter().GetResult();
            return ping.ExitCode == 0 ? null : $"scontrol ping: the Slurm controller is down ({ping.Stdout.Trim().Split('\n')[0]})";
        }
        catch (Win32Exception e)
        {
            return $"scontrol not found ({e.Message}): install the Slurm client";
        }
    }
}

/// <summary>
/// A fact that needs the Slurm cluster: skipped with the reason when `scontrol ping` fails, except under CI
/// (CI=true), where .ci/run starts the cluster and its absence fails the test.
/// </summary>
public sealed class SlurmFactAttribute : FactAttribute
{
    public SlurmFactAttribute()
    {
        if (SlurmCluster.WhyDown is { } reason && !SlurmCluster.UnderCi)
        {
            Skip = reason + "; start it with .ci/slurm/start.sh (skipped because CI is not 'true'; under CI this test fails)";
        }
    }

    /// <summary>Throws the clear message when the cluster is down (reached only when the test was not skipped).</summary>
    public static void Require()
    {
        if (SlurmCluster.WhyDown is { } reason)
        {
            throw new InvalidOperationException(reason + " (CI=true: the cluster tests require it; .ci/run starts it with .ci/slurm/start.sh)");
        }
    }
}
