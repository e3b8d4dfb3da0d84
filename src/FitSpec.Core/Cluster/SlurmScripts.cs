using System.Globalization;
using System.Text;

namespace FitSpec.Cluster;

/// <summary>
/// The two batch scripts for Slurm: an array job whose task i solves shard i of N (the shard comes from the
/// task's environment, --shard auto), and a merge job to run after every task has ended, whatever its exit
/// code (fits that fail acceptance or find no optimum exit non-zero, and the merge reports them).
/// </summary>
public static class SlurmScripts
{
    public const string ShardsFile = "fitspec-slurm-shards.sh";
    public const string MergeFile = "fitspec-slurm-merge.sh";

    /// <param name="job">The batch.</param>
    /// <param name="workingDir">Absolute folder the tasks start in (where relative spec and out paths lead).</param>
    /// <param name="logDir">Absolute folder for the tasks' logs (on shared storage).</param>
    public static string Shards(ClusterJob job, string workingDir, string logDir, string? partition, string? timeLimit)
    {
        ArgumentNullException.ThrowIfNull(job);
        var text = Header(job.Name + "-shards", workingDir, partition, timeLimit);
        text.Append(CultureInfo.InvariantCulture, $"#SBATCH --array=0-{job.Tasks - 1}\n");
        text.Append(CultureInfo.InvariantCulture, $"#SBATCH --cpus-per-task={job.Jobs}\n");
        text.Append(CultureInfo.InvariantCulture, $"#SBATCH --output={logDir}/slurm-%A_%a.log\n");
        text.Append("set -eu\n");
        text.Append("# Task i solves shard i of the array's task count (read from SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_COUNT).\n");
        text.Append(CultureInfo.InvariantCulture, $"exec {job.Tool} {ShellWords.Join(job.SolveArguments("auto"))}\n");
        return text.ToString();
    }

    public static string Merge(ClusterJob job, string workingDir, string logDir, string? partition, string? timeLimit)
    {
        ArgumentNullException.ThrowIfNull(job);
        var text = Header(job.Name + "-merge", workingDir, partition, timeLimit);
        text.Append(CultureInfo.InvariantCulture, $"#SBATCH --output={logDir}/slurm-merge-%j.log\n");
        text.Append("set -eu\n");
        text.Append(CultureInfo.InvariantCulture, $"exec {job.Tool} merge {ShellWords.Quote(job.OutDir)}\n");
        return text.ToString();
    }

    private static StringBuilder Header(string name, string workingDir, string? partition, string? timeLimit)
    {
        var text = new StringBuilder("#!/bin/bash\n");
        text.Append("# Written by 'fitspec cluster slurm'. Needs the tool on every node and the out folder on storage all nodes share.\n");
        text.Append(CultureInfo.InvariantCulture, $"#SBATCH --job-name={name}\n");
        text.Append(CultureInfo.InvariantCulture, $"#SBATCH --chdir={workingDir}\n");
        if (partition is not null)
        {
            text.Append(CultureInfo.InvariantCulture, $"#SBATCH --partition={partition}\n");
        }

        if (timeLimit is not null)
        {
            text.Append(CultureInfo.InvariantCulture, $"#SBATCH --time={timeLimit}\n");
        }

        return text;
    }
}
