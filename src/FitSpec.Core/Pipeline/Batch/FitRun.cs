namespace FitSpec.Pipeline.Batch;

/// <summary>How a fit's outputs came about in this run.</summary>
public enum FitSource
{
    /// <summary>Run through the pipeline (solved, or found invalid) and written.</summary>
    Solved,

    /// <summary>Unchanged since a run whose outputs are still in place: nothing was run or written.</summary>
    Cached,

    /// <summary>Not run at all (e.g. its name clashes with another fit of the run).</summary>
    Skipped,

    /// <summary>Stopped, or never started, because the run was cancelled: nothing written, nothing cached.</summary>
    Cancelled,
}

/// <summary>
/// One fit of a batch: its summary, where it came from, the files it has in the out folder (relative to it,
/// with '/'), and problems that stopped its files from being written (each counts as exit code 2).
/// </summary>
public sealed record FitRun(
    FitSummary Summary,
    FitSource Source,
    IReadOnlyList<string> Outputs,
    IReadOnlyList<string> Problems,
    TimeSpan Elapsed)
{
    public int ExitCode => Problems.Count > 0 ? Math.Max(2, Summary.ExitCode) : Summary.ExitCode;
}
