using System.Diagnostics;
using System.Globalization;
using System.Text.Json;
using FitSpec.Analysis;
using FitSpec.Data;
using FitSpec.Design;
using FitSpec.Lowering;
using FitSpec.Pipeline;
using FitSpec.Results;
using FitSpec.Solving;
using FitSpec.Spec;
using FitSpec.Verification;

namespace FitSpec.Bench;

/// <summary>
/// Where a fit's time and memory go: runs the pipeline's public stages one by one on each spec, with a
/// stopwatch around each (including the parts of the runner's insight step: plot series, leverage, LP ranging,
/// dual sentences), and then the whole fit (FitRunner) and each report format's writer. The whole fit's time
/// less the stages' sum is the runner's own assembly of the result. Memory: the process's resident set after each stage
/// and the live managed heap after a full collection (taken outside the timers).
/// Usage: FitSpec.Bench stages OUTDIR SPEC|FOLDER... — prints a table and one JSON line (prefix "json: ").
/// </summary>
internal static class StageTimes
{
    private static readonly string[] StageNames =
    [
        "read spec", "compile model", "load data", "build design", "lower", "solve", "verify",
        "insight: classical errors", "insight: LP ranging", "insight: plot series", "insight: loss shape", "insight: leverage", "insight: dual sentences",
        "whole fit (runner)", "write json", "write md", "write html",
    ];

    private const int PipelineStages = 13;

    public static int Run(IReadOnlyList<string> args)
    {
        if (args.Count < 2)
        {
            Console.Error.WriteLine("usage: FitSpec.Bench stages OUTDIR SPEC|FOLDER...");
            return 2;
        }

        var outDir = args[0];
        var specs = SpecDiscovery.Find([.. args.Skip(1)], out var missing);
        if (missing.Count > 0 || specs.Count == 0)
        {
            Console.Error.WriteLine($"no spec files found in: {string.Join(", ", args.Skip(1))}");
            return 2;
        }

        var seconds = StageNames.ToDictionary(s => s, _ => 0.0);
        var rssAfter = StageNames.ToDictionary(s => s, _ => 0L);
        var liveAfter = StageNames.ToDictionary(s => s, _ => 0L);
        var measureMemory = specs.Count == 1;
        var total = Stopwatch.StartNew();
        foreach (var path in specs)
        {
            var clock = new StageClock(seconds, rssAfter, liveAfter, measureMemory);
            var read = clock.Time("read spec", () => SpecReader.Read(path));
            var spec = read.Document ?? throw new InvalidOperationException($"{path}: the spec does not read: {read.Errors.FirstOrDefault()}");
            var model = clock.Time("compile model", () => ModelCompiler.Compile(spec));
            var table = clock.Time("load data", () => TableLoader.Load(spec, new DataRequest(model.ColumnsToRead, model.Filter?.Root)));
            var design = clock.Time("build design", () => DesignBuilder.Build(spec, model, table));
            var lowered = clock.Time("lower", () => FitLowering.Lower(spec, design));
            var options = new SolveOptions(spec.Solve.Method, spec.Solve.TimeLimit, (Formulation)(int)spec.Solve.Form);
            var solution = clock.Time("solve", () => Solver.Solve(lowered, options));
            var check = clock.Time("verify", () => Verifier.Check(lowered, solution));
            TimeInsight(clock, lowered, check);

            // Drop this fit's stage values before the whole run, so the resident set is not counted twice.
            GC.KeepAlive(solution);
            (read, model, table, design, lowered, solution, check) = (null!, null!, null!, null!, null!, null!, null!);
            var outcome = clock.Time("whole fit (runner)", () => FitRunner.RunForOutput(path));
            foreach (var (stage, format) in new[] { ("write json", ReportFormat.Json), ("write md", ReportFormat.Md), ("write html", ReportFormat.Html) })
            {
                clock.Time(stage, () => OutputWriter.Write(outcome.Result, outDir, [format], outcome.TemplateFolder));
            }
        }

        total.Stop();
        Print(specs.Count, seconds, rssAfter, liveAfter, measureMemory, total.Elapsed.TotalSeconds);
        return 0;
    }

    // The runner's insight step (internal to FitSpec.Core) is made of these public parts; timed one by one, in
    // its order and under its conditions. A bootstrap runs only when the spec asks (the bench specs do not).
    private static void TimeInsight(StageClock clock, LoweredFit fit, Checked check)
    {
        var spec = fit.Spec;
        var design = fit.Design;
        var isL2 = spec.Loss.Kind == LossKind.L2;
        var unconstrainedL2 = isL2 && fit.ClosedForm is { RidgeRows.Count: 0 } && fit.Constraints.Count == 0;
        clock.Time("insight: classical errors", () => unconstrainedL2 && check.Metrics.ResidualSd is { } sd ? ClassicalErrors.Compute(design, check.Beta, sd) : null);
        var ranging = clock.Time("insight: LP ranging", () => LpRanging.Compute(fit, check.Objective));
        clock.Time("insight: plot series", () => SeriesBuilder.Build(design, spec.Model.Response.Value, check.Beta, check.Residuals));
        clock.Time("insight: loss shape", () => (LossShape.Guides(spec, check.Objective), LossShape.Curve(spec.Loss, check.Residuals), LossShape.OutsideWidth(spec.Loss, check.Residuals, design.Table.Lines)));
        clock.Time("insight: leverage", () => isL2 ? LeverageCalculator.Compute(design) : null);
        clock.Time("insight: dual sentences", () => DualSentences.Read(fit, check.Constraints, ranging));
    }

    private static void Print(int fits, Dictionary<string, double> seconds, Dictionary<string, long> rssAfter, Dictionary<string, long> liveAfter, bool memory, double wall)
    {
        var stages = StageNames.Take(PipelineStages).Sum(s => seconds[s]);
        var rest = seconds["whole fit (runner)"] - stages;
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"Stage times over {fits} fit(s), in one process, seconds (sum over fits). {Environment.ProcessorCount} cores."));
        Console.WriteLine(memory ? "| stage | seconds | RSS after, MB | live heap after, MB |" : "| stage | seconds | ms per fit |");
        Console.WriteLine(memory ? "| --- | ---: | ---: | ---: |" : "| --- | ---: | ---: |");
        foreach (var s in StageNames)
        {
            Console.WriteLine(memory
                ? string.Create(CultureInfo.InvariantCulture, $"| {s} | {seconds[s]:F3} | {rssAfter[s] / 1e6:F0} | {liveAfter[s] / 1e6:F0} |")
                : string.Create(CultureInfo.InvariantCulture, $"| {s} | {seconds[s]:F3} | {1000 * seconds[s] / fits:F2} |"));
        }

        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"| whole fit less the stages above (≈ the runner's own result assembly; noisy, may be < 0) | {rest:F3} | |"));
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"| peak RSS of this process, MB | {Process.GetCurrentProcess().PeakWorkingSet64 / 1e6:F0} | |"));
        var record = new Dictionary<string, object>
        {
            ["fits"] = fits,
            ["wall_s"] = wall,
            ["seconds"] = seconds,
            ["runner_beyond_stages_s"] = rest,
            ["peak_rss_bytes"] = Process.GetCurrentProcess().PeakWorkingSet64,
        };
        if (memory)
        {
            record["rss_after_bytes"] = rssAfter;
            record["live_heap_after_bytes"] = liveAfter;
        }

        Console.WriteLine("json: " + JsonSerializer.Serialize(record));
    }

    /// <summary>Adds each stage's time to the totals; with memory on, samples RSS and the live heap after it.</summary>
    private sealed class StageClock(Dictionary<string, double> seconds, Dictionary<string, long> rss, Dictionary<string, long> live, bool memory)
    {
        public T Time<T>(string stage, Func<T> work)
        {
            var clock = Stopwatch.StartNew();
            var value = work();
            seconds[stage] += clock.Elapsed.TotalSeconds;
            if (memory)
            {
                rss[stage] = Environment.WorkingSet;
                live[stage] = GC.GetTotalMemory(forceFullCollection: true);
            }

            return value;
        }
    }
}
