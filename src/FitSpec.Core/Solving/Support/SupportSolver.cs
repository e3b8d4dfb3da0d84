using System.Diagnostics;
using System.Globalization;
using FitSpec.Lowering;
using FitSpec.Lowering.Penalties;
using Highs.Native;

namespace FitSpec.Solving.Support;

/// <summary>
/// Count fits. Where the program is an LP apart from the count rows, HiGHS's branch and cut solves the MILP;
/// where it has a Hessian (HiGHS has no mixed-integer QP), every support of at most K coefficients is solved
/// as its own QP, in parallel, and the best kept. Either way the answer is the solve on the chosen support
/// alone — coefficients outside it fixed at 0, the rest polished — and its duals are the ones reported.
/// </summary>
internal sealed class SupportSolver : IFitSolver
{
    /// <summary>Supports whose objectives differ by less than this (relative) are ties, won by the earlier one.</summary>
    public const double TieTolerance = 1e-9;

    public int Priority => 100;

    public bool CanSolve(LoweredFit fit, SolveOptions options) => fit?.Strategy is CountStrategy;

    public Solution Solve(LoweredFit fit, SolveOptions options, CancellationToken cancellation)
    {
        ArgumentNullException.ThrowIfNull(fit);
        ArgumentNullException.ThrowIfNull(options);
        var strategy = (CountStrategy)fit.Strategy!;
        return strategy.Mode == CountMode.Milp
            ? SolveMilp(fit, strategy, options, cancellation)
            : Enumerate(fit, strategy, options, cancellation);
    }

    private static Solution SolveMilp(LoweredFit fit, CountStrategy strategy, SolveOptions options, CancellationToken cancellation)
    {
        var clock = Stopwatch.StartNew();
        var run = RunMilp(fit.Program, options, cancellation);
        var status = HighsRunner.StatusOf(run.ModelStatus);
        var solver = $"HiGHS {HighsSolver.Version}";
        if (!run.HasPrimal || status is not (SolveStatus.Optimal or SolveStatus.TimeLimit))
        {
            return new Solution(status, null, null, null, solver, "branch and cut (HiGHS MILP)", "primal", clock.Elapsed.TotalSeconds, run.SimplexIterations, $"HiGHS model status: {run.ModelStatus}")
            {
                MipGap = run.HasPrimal ? run.MipGap : null,
                StatusDetail = status == SolveStatus.Infeasible ? ForcedDetail(strategy) : null,
            };
        }

        // z is integral only to the MIP feasibility tolerance; rounding picks the support it meant.
        var support = strategy.Counted.Where(c => run.ColValue[c.Binary] > 0.5).Select(c => c.Coefficient).ToHashSet();
        // The polish is one LP on a few coefficients: even after a MILP that used up the time limit it gets up to a
        // second, so that a time-limited fit still returns its best support's exact point.
        var polishOptions = options.TimeLimitSeconds is { } limit
            ? options with { TimeLimitSeconds = Math.Max(limit - clock.Elapsed.TotalSeconds, Math.Min(limit, 1)) }
            : options;
        var polished = Polish(fit, strategy, support, polishOptions, cancellation);
        var names = SupportNames(fit, support);
        var gap = run.MipGap;
        return polished.Solution with
        {
            Status = status == SolveStatus.TimeLimit && polished.Solution.Status == SolveStatus.Optimal ? SolveStatus.TimeLimit : polished.Solution.Status,
            Method = $"branch and cut (HiGHS MILP), then the {polished.Program.Class} on the chosen support",
            Seconds = clock.Elapsed.TotalSeconds,
            Iterations = run.SimplexIterations + polished.Solution.Iterations,
            Message = $"MILP: HiGHS model status {run.ModelStatus}; {polished.Solution.Message} on the chosen support",
            MipGap = gap,
            Notes =
            [
                new LoweringNote($"penalty {strategy.PenaltyIndex + 1}", $"count (max {strategy.Max})",
                    $"MILP {(status == SolveStatus.Optimal ? "optimal" : "stopped at the time limit")} (gap {gap.ToString("G3", CultureInfo.InvariantCulture)}); chosen support {names}; polished as {polished.Program.Class} with the other {strategy.Counted.Count - support.Count} fixed at 0"),
            ],
        };
    }

    private static Solution Enumerate(LoweredFit fit, CountStrategy strategy, SolveOptions options, CancellationToken cancellation)
    {
        var clock = Stopwatch.StartNew();
        var supports = Supports(strategy);
        var objective = new double[supports.Count];
        var statuses = new SolveStatus[supports.Count];
        var inner = new HighsFitSolver();
        var parallel = new ParallelOptions { CancellationToken = cancellation };
        Parallel.For(0, supports.Count, parallel, i =>
        {
            if (Remaining(options, clock) is { TimeLimitSeconds: <= 0 })
            {
                statuses[i] = SolveStatus.TimeLimit;
                objective[i] = double.NaN;
                return;
            }

            var program = SupportProgram.Restrict(fit, strategy, supports[i]);
            var s = inner.Solve(fit with { Program = program, Strategy = null }, options, cancellation);
            statuses[i] = s.Status;
            objective[i] = s.Status == SolveStatus.Optimal && s.X is { } x ? program.Objective(x) : double.PositiveInfinity;
        });

        var solver = $"HiGHS {HighsSolver.Version}";
        var method = $"enumeration of {supports.Count} supports, one QP each";
        if (statuses.Contains(SolveStatus.Unbounded))
        {
            return new Solution(SolveStatus.Unbounded, null, null, null, solver, method, "primal", clock.Elapsed.TotalSeconds, supports.Count, "a support's QP is unbounded");
        }

        // Deterministic whatever the thread count: every objective is known before the pick, and among ties
        // the earliest support (fewest coefficients, then model order) wins.
        var best = objective.Where(double.IsFinite).DefaultIfEmpty(double.PositiveInfinity).Min();
        var incomplete = statuses.Count(s => s == SolveStatus.TimeLimit);
        if (!double.IsFinite(best))
        {
            var status = incomplete > 0 ? SolveStatus.TimeLimit : statuses.Contains(SolveStatus.Error) ? SolveStatus.Error : SolveStatus.Infeasible;
            var why = ForcedDetail(strategy) ?? $"no support of at most {strategy.Max} coefficients gives a feasible QP";
            return new Solution(status, null, null, null, solver, method, "primal", clock.Elapsed.TotalSeconds, supports.Count, why)
            {
                StatusDetail = status == SolveStatus.Infeasible ? why : null,
            };
        }

        var tolerance = TieTolerance * Math.Max(1, Math.Abs(best));
        var chosen = Array.FindIndex(objective, v => v <= best + tolerance);
        var polished = Polish(fit, strategy, supports[chosen], options, cancellation);
        var infeasible = statuses.Count(s => s == SolveStatus.Infeasible);
        var names = SupportNames(fit, supports[chosen]);
        var detail = infeasible > 0 ? $"; {infeasible} infeasible" : string.Empty;
        return polished.Solution with
        {
            Status = incomplete > 0 && polished.Solution.Status == SolveStatus.Optimal ? SolveStatus.TimeLimit : polished.Solution.Status,
            Method = method,
            Seconds = clock.Elapsed.TotalSeconds,
            Message = $"best of {supports.Count} supports: {names}",
            Notes =
            [
                new LoweringNote($"penalty {strategy.PenaltyIndex + 1}", $"count (max {strategy.Max})",
                    $"{(incomplete > 0 ? $"enumerated {supports.Count - incomplete} of {supports.Count} supports (QPs) before the time limit" : $"enumerated {supports.Count} supports (QPs)")}{detail}; best support {names}, objective {best.ToString("G10", CultureInfo.InvariantCulture)}"),
            ],
        };
    }

    /// <summary>
    /// Every support the enumeration tries, in its tie-break order: the coefficients forced non-zero by their
    /// bounds always, plus each subset of the others of at most K − forced, by size and then in model order.
    /// </summary>
    internal static List<HashSet<int>> Supports(CountStrategy strategy)
    {
        var forced = strategy.Counted.Where(c => c.AlwaysNonZero).Select(c => c.Coefficient).ToList();
        var free = strategy.Counted.Where(c => !c.AlwaysNonZero && !c.AlwaysZero).Select(c => c.Coefficient).ToList();
        var room = Math.Min(strategy.Max - forced.Count, free.Count);
        var result = new List<HashSet<int>>();
        for (var size = 0; size <= room; size++)
        {
            var pick = Enumerable.Range(0, size).ToArray();
            while (true)
            {
                result.Add([.. forced, .. pick.Select(k => free[k])]);
                // Next combination in lexicographic order: raise the last position that can still move.
                var t = size - 1;
                while (t >= 0 && pick[t] == free.Count - size + t)
                {
                    t--;
                }

                if (t < 0)
                {
                    break;
                }

                pick[t]++;
                for (var u = t + 1; u < size; u++)
                {
                    pick[u] = pick[u - 1] + 1;
                }
            }
        }

        return result;
    }

    // The final solve: the program on the support alone (an LP or QP), with its own duals.
    private static (Solution Solution, FitProgram Program) Polish(LoweredFit fit, CountStrategy strategy, HashSet<int> support, SolveOptions options, CancellationToken cancellation)
    {
        var program = SupportProgram.Restrict(fit, strategy, support);
        var solution = new HighsFitSolver().Solve(fit with { Program = program, Strategy = null }, options, cancellation);
        var raw = solution.X is { } x ? SupportProgram.Raw(fit.Design, x, support, strategy) : null;
        return (solution with { Raw = raw, SolvedProgram = program }, program);
    }

    // The one cause of infeasibility a count adds by itself: more coefficients forced non-zero than it allows.
    private static string? ForcedDetail(CountStrategy strategy)
    {
        var forced = strategy.Counted.Where(c => c.AlwaysNonZero).Select(c => c.Name).ToList();
        return forced.Count > strategy.Max
            ? $"the count allows at most {strategy.Max} non-zero coefficients, but the bounds of {forced.Count} exclude 0 ({string.Join(", ", forced)})"
            : null;
    }

    private static SolveOptions Remaining(SolveOptions options, Stopwatch clock) =>
        options.TimeLimitSeconds is { } limit ? options with { TimeLimitSeconds = Math.Max(0, limit - clock.Elapsed.TotalSeconds) } : options;

    private static string SupportNames(LoweredFit fit, IReadOnlySet<int> support) =>
        support.Count == 0 ? "{} (none)" : "{" + string.Join(", ", support.Order().Select(j => fit.Design.Coefficients[j].Name)) + "}";

    private static HighsResult RunMilp(FitProgram program, SolveOptions options, CancellationToken cancellation)
    {
        using var highs = new HighsSolver();
        highs.SetOption("output_flag", false);
        // One thread: the same branch-and-cut path, so the same support, on every run.
        highs.SetOption("threads", 1);
        if (options.TimeLimitSeconds is { } limit)
        {
            highs.SetOption("time_limit", limit);
        }

        highs.SetOption("primal_feasibility_tolerance", 1e-9);
        highs.SetOption("dual_feasibility_tolerance", 1e-9);
        highs.SetOption("mip_feasibility_tolerance", 1e-9);
        // Close the gap essentially fully: HiGHS's default (1e-4 relative) may stop at a worse support.
        highs.SetOption("mip_rel_gap", 1e-9);
        highs.SetOption("mip_abs_gap", 1e-12);
        highs.PassModel(HighsModels.From(program));
        // Branch and cut can run long: Ctrl-C stops it through HiGHS's callback.
        return highs.Run(new HighsRunMonitor(cancellation));
    }
}
