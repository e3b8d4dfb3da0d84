using System.Globalization;
using System.Text;
using FitSpec.Pipeline.Batch;
using FitSpec.Solving;

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
        FitSource.Cancelled => "(not finished)",
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

    /// <summary>A long fit while it solves: "lc7: solving 12.3 s, 45210 HiGHS iterations, objective 42.1, gap 0.52%".</summary>
    public static string Solving(string name, SolveProgress progress)
    {
        ArgumentNullException.ThrowIfNull(progress);
        var line = new StringBuilder();
        line.Append(CultureInfo.InvariantCulture, $"{name}: solving {progress.Elapsed.TotalSeconds:F1} s, {Count(progress.Iterations, "HiGHS iteration")}");
        if (progress.Programs > 1)
        {
            line.Append(CultureInfo.InvariantCulture, $", program {progress.Programs}");
        }

        if (progress.Objective is { } objective)
        {
            line.Append(CultureInfo.InvariantCulture, $", objective {objective:G8}");
        }

        if (progress.MipGap is { } gap)
        {
            line.Append(CultureInfo.InvariantCulture, $", gap {100 * gap:0.###}%");
        }

        return line.ToString();
    }

    /// <summary>Shown while a cancelled run waits for its fits to stop.</summary>
    public const string Cancelling = "cancelling: stopping the fits under way; Ctrl-C again quits at once";

    private static string Count(long n, string noun) => $"{n} {noun}{(n == 1 ? "" : "s")}";

    /// <summary>"total: 30 fits (28 solved, 2 cached): 27 passed, 1 failed acceptance, 0 no optimum, 2 errors; exit 2".</summary>
    public static string Total(IReadOnlyList<FitRun> runs, int exit)
    {
        var solved = runs.Count(r => r.Source == FitSource.Solved);
        var cached = runs.Count(r => r.Source == FitSource.Cached);
        var skipped = runs.Count(r => r.Source == FitSource.Skipped);
        var cancelled = runs.Count(r => r.Source == FitSource.Cancelled);
        var sources = $"{solved} solved, {cached} cached" + (skipped > 0 ? $", {skipped} not run" : "") + (cancelled > 0 ? $", {cancelled} cancelled" : "");
        return $"total: {runs.Count} {(runs.Count == 1 ? "fit" : "fits")} ({sources}): " +
            $"{runs.Count(r => r.ExitCode == 0)} passed, {runs.Count(r => r.ExitCode == 1)} failed acceptance, " +
            $"{runs.Count(r => r.ExitCode == 3)} no optimum, {Count(runs.Count(r => r.ExitCode == 2), "error")}; exit {exit}";
    }
}
