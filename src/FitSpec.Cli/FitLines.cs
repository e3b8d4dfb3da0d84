using System.Globalization;
using FitSpec.Pipeline.Batch;

namespace FitSpec.Cli;

/// <summary>The one-line texts the solve command prints about a fit.</summary>
internal static class FitLines
{
    /// <summary>name: status, objective and acceptance, e.g. "lc7: optimal objective 42.1, 2 acceptance rules passed".</summary>
    public static string Outcome(FitSummary s)
    {
        var objective = s.Objective is { } o ? string.Create(CultureInfo.InvariantCulture, $" objective {o:G10}") : "";
        var failed = s.AcceptanceTotal - s.AcceptancePassed;
        var acceptance = s.AcceptanceTotal == 0 ? ""
            : failed == 0 ? $", {s.AcceptanceTotal} acceptance rules passed"
            : $", {failed} of {s.AcceptanceTotal} acceptance rules FAILED";
        return $"{s.Name}: {s.Status}{objective}{acceptance}";
    }

    /// <summary>Where the fit's files came from: "(cached)", "(0.05 s)", "(not run)".</summary>
    public static string Source(FitRun run) => run.Source switch
    {
        FitSource.Cached => "(cached)",
        FitSource.Skipped => "(not run)",
        _ => string.Create(CultureInfo.InvariantCulture, $"({run.Elapsed.TotalSeconds:F2} s)"),
    };

    /// <summary>The progress line for a finished fit: "[12/200] lc7: optimal objective 42.1 (cached)".</summary>
    public static string Progress(FitRun run, int done, int total) =>
        $"[{done}/{total}] {Outcome(run.Summary)}{(run.Problems.Count > 0 ? ", files NOT written" : "")} {Source(run)}";

    /// <summary>What goes to stderr about a fit: its errors, why it has no optimum, what could not be written.</summary>
    public static IEnumerable<string> Problems(FitRun run)
    {
        var s = run.Summary;
        foreach (var e in s.Errors)
        {
            yield return e;
        }

        if (s.Errors.Count == 0 && !s.Solved)
        {
            yield return $"{Outcome(s)}: {s.StatusDetail}";
        }

        foreach (var p in run.Problems)
        {
            yield return p;
        }
    }

    private static string Count(int n, string noun) => $"{n} {noun}{(n == 1 ? "" : "s")}";

    /// <summary>"total: 30 fits (28 solved, 2 cached): 27 passed, 1 failed acceptance, 0 no optimum, 2 errors; exit 2".</summary>
    public static string Total(IReadOnlyList<FitRun> runs, int exit)
    {
        var solved = runs.Count(r => r.Source == FitSource.Solved);
        var cached = runs.Count(r => r.Source == FitSource.Cached);
        var skipped = runs.Count(r => r.Source == FitSource.Skipped);
        var sources = $"{solved} solved, {cached} cached" + (skipped > 0 ? $", {skipped} not run" : "");
        return $"total: {runs.Count} {(runs.Count == 1 ? "fit" : "fits")} ({sources}): " +
            $"{runs.Count(r => r.ExitCode == 0)} passed, {runs.Count(r => r.ExitCode == 1)} failed acceptance, " +
            $"{runs.Count(r => r.ExitCode == 3)} no optimum, {Count(runs.Count(r => r.ExitCode == 2), "error")}; exit {exit}";
    }
}
