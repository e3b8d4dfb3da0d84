using System.Collections.Concurrent;
using System.Diagnostics;
using FitSpec.Lowering;
using FitSpec.Pipeline;
using FitSpec.Solving;
using FitSpec.Spec;
using FitSpec.Tests.Cli;
using Highs.Native;

namespace FitSpec.Tests.Solving;

/// <summary>
/// HiGHS's C callback through the binding: the declared struct layout is the loaded library's, the values
/// read through it are sane (they move the way branch and bound and simplex move, and end where HiGHS's own
/// final report ends), a cancelled token interrupts a run, and a fit's long solve reports progress and ends
/// in OperationCanceledException (which the batch turns into a cancelled fit) soon after it is cancelled.
/// </summary>
public sealed class ProgressCallbackTests : IDisposable
{
    private const int Reports = 12;

    private readonly Support.TempFolder _temp = new("fitspec-progress");

    /// <summary>
    /// A 0-1 multi-knapsack with correlated weights (invented; branch and bound needs more than 5 s on it),
    /// cancelled from the sink once a dozen reports are in and branching has begun: HiGHS stops with status
    /// Interrupt, no exception, and every report on the way is consistent with branch and bound.
    /// </summary>
    [Fact]
    public void A_mip_reports_consistent_values_and_stops_when_cancelled()
    {
        using var highs = new HighsSolver();
        highs.SetOption("output_flag", false);
        highs.SetOption("threads", 1);
        highs.SetOption("time_limit", 30.0);
        highs.PassModel(Knapsack(items: 60, constraints: 5));
        var reports = new List<HighsProgress>();
        using var cancel = new CancellationTokenSource();
        var monitor = new HighsRunMonitor(cancel.Token, p =>
        {
            reports.Add(p);
            if (reports.Count >= Reports && p.MipNodes > 0)
            {
                cancel.Cancel();
            }
        }, TimeSpan.FromMilliseconds(20));

        var result = highs.Run(monitor);

        Assert.True(HighsCallbackLayout.Verified, "layout: " + string.Join("; ", HighsCallbackLayout.Mismatches));
        Assert.Equal(HighsModelStatus.Interrupt, result.ModelStatus);
        Assert.True(monitor.Interrupted);
        Assert.True(reports.Count >= Reports, $"{reports.Count} reports");
        for (var k = 1; k < reports.Count; k++)
        {
            var (before, after) = (reports[k - 1], reports[k]);
            Assert.True(after.Seconds >= before.Seconds, $"time went back at report {k}");
            Assert.True(after.MipNodes >= before.MipNodes, $"nodes went back at report {k}");
            Assert.True(after.MipLpIterations >= before.MipLpIterations, $"LP iterations went back at report {k}");
            // Minimising: the best point only improves, the proven bound only rises.
            Assert.False(after.Objective > before.Objective, $"incumbent got worse at report {k}");
            Assert.False(after.MipDualBound < before.MipDualBound, $"bound fell at report {k}");
        }

        var last = reports[^1];
        Assert.InRange(last.Seconds, double.Epsilon, result.RunTimeSeconds + 0.01);
        Assert.True(last.MipNodes > 0 && last.MipLpIterations > 0, last.ToString());
        Assert.True(last.MipDualBound <= last.Objective, last.ToString());
        Assert.InRange(last.MipGap, 0, 1);
        // HiGHS's final answer is at least as good as the last incumbent reported and no better than its bound;
        // its final gap is no wider than the last one reported (a point or a bound may improve in between).
        var tolerance = 1e-9 * Math.Abs(last.Objective);
        Assert.InRange(result.ObjectiveValue, last.MipDualBound - tolerance, last.Objective + tolerance);
        Assert.InRange(result.MipGap, 0, last.MipGap + 1e-12);
    }

    /// <summary>Simplex on the slow fit's primal LP: iteration counts rise, and stop short of HiGHS's final count.</summary>
    [Fact]
    public void An_lp_reports_rising_simplex_iterations_and_stops_when_cancelled()
    {
        var program = Lower(CancelFits.SlowSpec(), CancelFits.SlowCsv()).Program;
        using var highs = new HighsSolver();
        highs.SetOption("output_flag", false);
        highs.SetOption("solver", "simplex");
        highs.PassModel(HighsModels.From(program));
        var reports = new List<HighsProgress>();
        using var cancel = new CancellationTokenSource();
        var monitor = new HighsRunMonitor(cancel.Token, p =>
        {
            reports.Add(p);
            if (reports.Count >= Reports)
            {
                cancel.Cancel();
            }
        }, TimeSpan.FromMilliseconds(20));

        var result = highs.Run(monitor);

        Assert.Equal(HighsModelStatus.Interrupt, result.ModelStatus);
        Assert.Equal(Reports, reports.Count);
        Assert.True(reports[^1].SimplexIterations > reports[0].SimplexIterations);
        for (var k = 1; k < reports.Count; k++)
        {
            Assert.True(reports[k].SimplexIterations >= reports[k - 1].SimplexIterations, $"iterations went back at report {k}");
            Assert.True(reports[k].Seconds >= reports[k - 1].Seconds, $"time went back at report {k}");
        }

        Assert.InRange(reports[^1].SimplexIterations, 1, result.SimplexIterations);
        Assert.Equal(-1, reports[^1].MipNodes);
    }

    /// <summary>
    /// The whole solve stage on the slow fit: nothing is reported for the first two seconds, then progress
    /// with the time and iterations so far; cancelling from the sink ends the solve within two seconds with
    /// OperationCanceledException (the batch's signal for a cancelled fit).
    /// </summary>
    [Fact]
    public void A_long_solve_reports_progress_after_two_seconds_and_a_cancel_stops_it()
    {
        var fit = Lower(CancelFits.SlowSpec(), CancelFits.SlowCsv());
        using var cancel = new CancellationTokenSource();
        var sink = new Sink(_ => cancel.Cancel());
        var options = new SolveOptions(SolveMethod.Simplex, null, Formulation.Primal) { Progress = sink };

        var clock = Stopwatch.StartNew();
        var stopped = Assert.ThrowsAny<OperationCanceledException>(() => Solver.Solve(fit, options, cancel.Token));
        var total = clock.Elapsed;

        Assert.Equal(cancel.Token, stopped.CancellationToken);
        Assert.True(sink.Reports.TryPeek(out var first), "no progress was reported");
        Assert.InRange(first.Elapsed.TotalSeconds, SolveProgress.QuietSeconds, SolveProgress.QuietSeconds + 1);
        Assert.True(first.Iterations > 0, first.ToString());
        Assert.Equal(1, first.Programs);
        Assert.Null(first.MipGap);
        Assert.InRange((total - first.Elapsed).TotalSeconds, 0, 2);
    }

    /// <summary>Progress reaches a solve through the enclosing scope when its options name no sink.</summary>
    [Fact]
    public void The_scope_supplies_the_sink_when_the_options_have_none()
    {
        var sink = new Sink(_ => { });
        var outer = SolveProgressScope.Current;
        using (SolveProgressScope.Enter(sink))
        {
            Assert.Same(sink, SolveProgressScope.Current);
            Assert.Same(sink, new HighsRunner(new SolveOptions(SolveMethod.Auto, null), default).Progress);
        }

        Assert.Same(outer, SolveProgressScope.Current);
    }

    public void Dispose() => _temp.Dispose();

    private LoweredFit Lower(string spec, string csv)
    {
        var path = CancelFits.Write(_temp.Path, "slow", spec, csv);
        return FitRunner.Lower(SpecReader.Read(path).Document!, forceProgram: false);
    }

    // Maximise the value of the chosen items under several capacity rows (as a minimisation of −value).
    private static HighsModel Knapsack(int items, int constraints)
    {
        var random = new Random(1);
        var cost = new double[items];
        var start = new int[items + 1];
        var index = new int[items * constraints];
        var value = new double[items * constraints];
        var capacity = new double[constraints];
        for (var j = 0; j < items; j++)
        {
            double sum = 0;
            for (var i = 0; i < constraints; i++)
            {
                var w = random.Next(1, 1000);
                index[(j * constraints) + i] = i;
                value[(j * constraints) + i] = w;
                capacity[i] += w / 2.0;
                sum += w;
            }

            cost[j] = -((sum / constraints) + random.Next(0, 100));
            start[j + 1] = (j + 1) * constraints;
        }

        return new HighsModel(
            items, constraints, 0, cost, new double[items], Enumerable.Repeat(1.0, items).ToArray(),
            Enumerable.Repeat(double.NegativeInfinity, constraints).ToArray(), capacity, start, index, value,
            Integer: Enumerable.Repeat(true, items).ToArray());
    }

    private sealed class Sink(Action<SolveProgress> then) : IProgress<SolveProgress>
    {
        public ConcurrentQueue<SolveProgress> Reports { get; } = new();

        public void Report(SolveProgress value)
        {
            Reports.Enqueue(value);
            then(value);
        }
    }
}
