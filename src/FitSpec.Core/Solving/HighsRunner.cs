using System.Diagnostics;
using FitSpec.Lowering;
using Highs.Native;

namespace FitSpec.Solving;

/// <summary>One program's answer: HiGHS's status, the point and multipliers on the program's variables and rows.</summary>
internal sealed record HighsRunResult(SolveStatus Status, double[] X, double[]? RowDual, double[]? ColDual, HighsModelStatus ModelStatus, bool HasPrimal = true);

/// <summary>
/// Solves programs with HiGHS — the one program of a fit, or each subproblem of a sequential method — under
/// one time budget for the whole fit, and counts what it did. One instance per fit solve (not shared).
/// Every HiGHS run is watched: a cancelled token interrupts it and ends the fit's solve with
/// OperationCanceledException, and a solve longer than <see cref="SolveProgress.QuietSeconds"/> reports its
/// progress to the options' sink.
/// </summary>
internal sealed class HighsRunner
{
    private readonly SolveOptions _options;
    private readonly CancellationToken _cancellation;
    private readonly Stopwatch _clock = Stopwatch.StartNew();
    private readonly IProgress<SolveProgress>? _progress;
    private readonly HighsRunMonitor _monitor;

    public HighsRunner(SolveOptions options, CancellationToken cancellation)
    {
        _options = options;
        _cancellation = cancellation;
        _progress = options.Progress ?? SolveProgressScope.Current;
        _monitor = new HighsRunMonitor(cancellation, _progress is null ? null : Report);
    }

    public int Solves { get; private set; }

    /// <summary>Where this solve's progress goes (the options' sink, else the enclosing scope's), if anywhere.</summary>
    public IProgress<SolveProgress>? Progress => _progress;

    public long HighsIterations { get; private set; }

    public double Seconds => _clock.Elapsed.TotalSeconds;

    /// <summary>Whether the last solve went through the LP dual, and how many rows that had.</summary>
    public bool UsedDual { get; private set; }

    public int DualRows { get; private set; }

    /// <summary>Whether the last dual LP went to interior point by the auto rule.</summary>
    public bool UsedInteriorPoint { get; private set; }

    /// <summary>
    /// True once the fit's time limit is spent. Throws OperationCanceledException once the fit is cancelled, so
    /// that every loop asking it between steps (some steps need no HiGHS run) stops at once.
    /// </summary>
    public bool OutOfTime
    {
        get
        {
            _cancellation.ThrowIfCancellationRequested();
            return _options.TimeLimitSeconds is { } limit && Seconds >= limit;
        }
    }

    /// <param name="program">The subproblem.</param>
    /// <param name="viaDual">
    /// For an LP: whether to solve it through its dual (the l1 start: yes; the minimax LPs: no, being faster as
    /// they are); null for whichever has fewer rows. The user's solve.form overrides it.
    /// </param>
    public HighsRunResult Solve(FitProgram program, bool? viaDual = null)
    {
        _cancellation.ThrowIfCancellationRequested();
        Solves++;
        UsedDual = false;
        var useDual = program.Class == ProblemClass.LP && _options.Formulation switch
        {
            Formulation.Dual => true,
            Formulation.Primal => false,
            _ => viaDual ?? LpDual.RowCount(program) < program.NumRows,
        };
        if (useDual)
        {
            var dual = LpDual.Build(program);
            // Measured (DEVELOPERS.md): on the dual of an l1-type fit, interior point with crossover is 3× faster
            // than simplex at 10⁴ observations and 14× at 10⁵, and level at 10³.
            var interiorPoint = _options.Method == Spec.SolveMethod.Auto && dual.Model.NumCol > InteriorPointColumns;
            UsedInteriorPoint = interiorPoint;
            var run = Run(dual.Model, isLp: true, program, interiorPoint);
            if (run.ModelStatus == HighsModelStatus.Optimal)
            {
                var (x, rowDual, colDual) = dual.Recover(run);
                UsedDual = true;
                DualRows = dual.Model.NumRow;
                return Map(run, x, rowDual, colDual) with { HasPrimal = true };
            }

            // The dual's status says less about the primal (an infeasible dual leaves the primal unbounded or
            // infeasible): ask the primal.
        }

        var sigma = ObjectiveScale(program);
        var scaled = sigma == 1 ? program : program with
        {
            Cost = program.Cost.Select(c => sigma * c).ToArray(),
            QValue = program.QValue.Select(q => sigma * q).ToArray(),
            Offset = sigma * program.Offset,
        };
        HighsResult? direct = null;
        try
        {
            // QPs start from their equality rows and take inequality rows as they become violated: HiGHS's
            // QP solver can fail at its start when many inequality rows are present but not binding.
            if (program.HasQuadratic && HasInequalityRows(program))
            {
                direct = RowGeneration(scaled);
            }

            direct ??= Run(HighsModels.From(scaled), program.Class == ProblemClass.LP, scaled);
        }
        catch (InvalidOperationException)
        {
            // HiGHS refuses a model whose numbers it cannot take (the binding reports it this way).
            return new HighsRunResult(SolveStatus.Error, [], null, null, HighsModelStatus.ModelError);
        }

        return Map(direct, direct.ColValue, direct.RowDual.Select(y => y / sigma).ToArray(), direct.ColDual.Select(z => z / sigma).ToArray());
    }

    // Row generation: solving with the equality rows only and adding each inequality row once it is violated
    // gives the same optimum (a relaxation whose answer is feasible is optimal; every fit objective is
    // bounded below, so the relaxations are bounded); rows never added carry a zero dual.
    private static bool HasInequalityRows(FitProgram program)
    {
        for (var r = 0; r < program.NumRows; r++)
        {
            if (program.RowLower[r] != program.RowUpper[r])
            {
                return true;
            }
        }

        return false;
    }

    private HighsResult? RowGeneration(FitProgram program)
    {
        var m = program.NumRows;
        var active = new bool[m];
        for (var r = 0; r < m; r++)
        {
            active[r] = program.RowLower[r] == program.RowUpper[r];
        }

        for (var round = 0; round < 100 && !OutOfTime; round++)
        {
            var rows = Enumerable.Range(0, m).Where(r => active[r]).ToArray();
            var sub = Restrict(program, rows);
            var run = Run(HighsModels.From(sub), isLp: false, sub);
            if (run.ModelStatus != HighsModelStatus.Optimal)
            {
                return null;
            }

            var activity = program.RowActivity(run.ColValue);
            var added = false;
            for (var r = 0; r < m; r++)
            {
                var tolerance = 1e-9 * Math.Max(1, Math.Abs(activity[r]));
                if (!active[r] && (activity[r] < program.RowLower[r] - tolerance || activity[r] > program.RowUpper[r] + tolerance))
                {
                    active[r] = true;
                    added = true;
                }
            }

            if (!added)
            {
                var rowDual = new double[m];
                var rowValue = new double[m];
                for (var k = 0; k < rows.Length; k++)
                {
                    rowDual[rows[k]] = run.RowDual[k];
                }

                Array.Copy(activity, rowValue, m);
                return run with { RowDual = rowDual, RowValue = rowValue };
            }
        }

        return null;
    }

    private static FitProgram Restrict(FitProgram p, int[] rows)
    {
        var newIndex = new int[p.NumRows];
        Array.Fill(newIndex, -1);
        for (var k = 0; k < rows.Length; k++)
        {
            newIndex[rows[k]] = k;
        }

        var start = new int[p.NumVars + 1];
        var index = new List<int>();
        var value = new List<double>();
        for (var j = 0; j < p.NumVars; j++)
        {
            for (var k = p.ColStart[j]; k < p.ColStart[j + 1]; k++)
            {
                if (newIndex[p.RowIndex[k]] is var r and >= 0)
                {
                    index.Add(r);
                    value.Add(p.Values[k]);
                }
            }

            start[j + 1] = index.Count;
        }

        return p with
        {
            RowNames = rows.Select(r => p.RowNames[r]).ToArray(),
            RowLower = rows.Select(r => p.RowLower[r]).ToArray(),
            RowUpper = rows.Select(r => p.RowUpper[r]).ToArray(),
            RowOrigin = rows.Select(r => p.RowOrigin[r]).ToArray(),
            ColStart = start,
            RowIndex = [.. index],
            Values = [.. value],
        };
    }

    // A barrier's curvature grows without bound near its limit; HiGHS treats costs above 1e20 as infinite
    // and refuses Hessian entries above 1e15. Scaling the whole objective (the minimiser is unchanged, the
    // multipliers scale with it) keeps every entry well inside those limits.
    private static double ObjectiveScale(FitProgram program)
    {
        var q = program.QValue.Length == 0 ? 0 : program.QValue.Max(Math.Abs);
        var c = program.Cost.Length == 0 ? 0 : program.Cost.Max(Math.Abs);
        var sigma = Math.Min(1, Math.Min(q > 0 ? 1e8 / q : 1, c > 0 ? 1e12 / c : 1));
        return sigma > 0 && double.IsFinite(sigma) ? sigma : 1;
    }

    // QPs are solved first without HiGHS's default QP regularisation, which limits the answer to about six
    // digits and so the KKT residual the sequence can reach. Without it HiGHS can also stop at once and call
    // its starting point optimal (seen with free split variables that have no curvature); so an answer is
    // kept only if its own stationarity holds, and otherwise the default is tried and the better one kept.
    /// <summary>Dual LPs with more columns than this go to interior point (with crossover) under solve.method auto.</summary>
    public const int InteriorPointColumns = 5000;

    private HighsResult Run(HighsModel model, bool isLp, FitProgram program, bool interiorPoint = false)
    {
        var result = RunOnce(model, isLp, exactQp: !isLp, interiorPoint);
        if (isLp || result.ModelStatus is HighsModelStatus.Infeasible or HighsModelStatus.Unbounded or HighsModelStatus.TimeLimit)
        {
            return result;
        }

        var residual = result.ModelStatus == HighsModelStatus.Optimal ? Stationarity(program, result) : double.PositiveInfinity;
        if (residual <= 1e-9)
        {
            return result;
        }

        // Small strictly convex QPs: finish exactly from HiGHS's (feasible) point.
        if (result.ModelStatus == HighsModelStatus.Optimal && DenseActiveSet.Applies(program)
            && DenseActiveSet.Solve(program, result.ColValue) is { } dense && Stationarity(program, dense) <= 1e-9)
        {
            return dense;
        }

        var proximal = Proximal(program, model);
        if (proximal is not null)
        {
            return proximal;
        }

        var regularised = RunOnce(model, isLp, exactQp: false);
        var other = regularised.ModelStatus == HighsModelStatus.Optimal ? Stationarity(program, regularised) : double.PositiveInfinity;
        return other < residual || result.ModelStatus != HighsModelStatus.Optimal ? regularised : result;
    }

    // Proximal-point iterations: min f(x) + ρ/2‖x − x_k‖², each strictly convex (so HiGHS does not stop at its
    // start), converging to the exact minimiser of f as the centre moves; stop when f's own KKT holds.
    private HighsResult? Proximal(FitProgram program, HighsModel model)
    {
        var n = program.NumVars;
        double diag = 1;
        for (var j = 0; j < program.QStart.Length - 1; j++)
        {
            for (var k = program.QStart[j]; k < program.QStart[j + 1]; k++)
            {
                if (program.QIndex[k] == j)
                {
                    diag = Math.Max(diag, Math.Abs(program.QValue[k]));
                }
            }
        }

        var rho = 1e-3 * diag;
        var center = new double[n];
        HighsResult? last = null;
        for (var iteration = 0; iteration < ProximalIterations && !OutOfTime; iteration++)
        {
            var shifted = ProximalModel(program, model, rho, center);
            var run = RunOnce(shifted, isLp: false, exactQp: true);
            if (run.ModelStatus != HighsModelStatus.Optimal)
            {
                return last;
            }

            last = run;
            Array.Copy(run.ColValue, center, n);
            if (Stationarity(program, run) <= 1e-9)
            {
                return run;
            }
        }

        return last is not null && Stationarity(program, last) <= 1e-7 ? last : null;
    }

    private const int ProximalIterations = 60;

    private static HighsModel ProximalModel(FitProgram program, HighsModel model, double rho, double[] center)
    {
        // Add ρ to every diagonal entry of Q (inserting missing diagonals) and −ρ x_k to the cost.
        var n = program.NumVars;
        var start = new int[n + 1];
        var index = new List<int>(program.QValue.Length + n);
        var value = new List<double>(program.QValue.Length + n);
        for (var j = 0; j < n; j++)
        {
            var hasDiagonal = false;
            if (program.QStart.Length > 0)
            {
                for (var k = program.QStart[j]; k < program.QStart[j + 1]; k++)
                {
                    var i = program.QIndex[k];
                    var v = program.QValue[k];
                    if (i == j)
                    {
                        v += rho;
                        hasDiagonal = true;
                    }

                    index.Add(i);
                    value.Add(v);
                }
            }

            if (!hasDiagonal)
            {
                // Lower triangle column-wise: the diagonal is the smallest row index of column j.
                var at = start[j];
                index.Insert(at, j);
                value.Insert(at, rho);
            }

            start[j + 1] = index.Count;
        }

        var cost = new double[n];
        for (var j = 0; j < n; j++)
        {
            cost[j] = model.ColCost[j] - (rho * center[j]);
        }

        var offset = model.Offset;
        for (var j = 0; j < n; j++)
        {
            offset += 0.5 * rho * center[j] * center[j];
        }

        return model with { ColCost = cost, QStart = start, QIndex = [.. index], QValue = [.. value], Offset = offset };
    }

    // ‖c + Qx − A'y − z‖∞ of the QP as HiGHS solved it, relative to max(1, |c_j| + |(Qx)_j|).
    private static double Stationarity(FitProgram program, HighsResult run)
    {
        var x = run.ColValue;
        var qx = program.HessianTimes(x);
        double worst = 0, scale = 1;
        for (var j = 0; j < program.NumVars; j++)
        {
            var g = program.Cost[j] + qx[j] - run.ColDual[j];
            for (var k = program.ColStart[j]; k < program.ColStart[j + 1]; k++)
            {
                g -= program.Values[k] * run.RowDual[program.RowIndex[k]];
            }

            worst = Math.Max(worst, Math.Abs(g));
            // A bound multiplier is only a multiplier at its bound: HiGHS has been seen to stop at its start with
            // the whole gradient of a free variable in z, which satisfies the line above trivially.
            var zj = run.ColDual[j];
            var lo = program.Lower[j];
            var hi = program.Upper[j];
            var atLower = double.IsFinite(lo) && Math.Abs(x[j] - lo) <= 1e-9 * Math.Max(1, Math.Abs(lo));
            var atUpper = double.IsFinite(hi) && Math.Abs(x[j] - hi) <= 1e-9 * Math.Max(1, Math.Abs(hi));
            if ((zj > 0 && !atLower) || (zj < 0 && !atUpper))
            {
                worst = Math.Max(worst, Math.Abs(zj));
            }

            scale = Math.Max(scale, Math.Abs(program.Cost[j]) + Math.Abs(qx[j]));
        }

        return worst / scale;
    }

    private HighsResult RunOnce(HighsModel model, bool isLp, bool exactQp, bool interiorPoint = false)
    {
        using var highs = new HighsSolver();
        highs.SetOption("output_flag", false);
        highs.SetOption("threads", 1);
        if (_options.TimeLimitSeconds is { } limit)
        {
            highs.SetOption("time_limit", Math.Max(limit - Seconds, 1e-3));
        }

        // The user's method choice applies to the LPs of the sequence; QPs go to HiGHS's QP solver.
        if (isLp && interiorPoint)
        {
            highs.SetOption("solver", "ipm");
        }
        else if (isLp)
        {
            switch (_options.Method)
            {
                case Spec.SolveMethod.Simplex:
                    highs.SetOption("solver", "simplex");
                    break;
                case Spec.SolveMethod.Ipm:
                    highs.SetOption("solver", "ipm");
                    break;
            }
        }

        // Tight tolerances: the sequence stops on a KKT test of its own, which cannot beat the subproblem's.
        highs.SetOption("primal_feasibility_tolerance", 1e-10);
        highs.SetOption("dual_feasibility_tolerance", 1e-10);
        if (exactQp)
        {
            highs.SetOption("qp_regularization_value", 0.0);
        }

        highs.PassModel(model);
        var run = highs.Run(_monitor);
        HighsIterations += run.SimplexIterations + run.IpmIterations + run.QpIterations;
        // A cancelled fit ends here, whether HiGHS was interrupted or finished just as the request came (QP runs
        // cannot be interrupted): its answer is not wanted.
        _cancellation.ThrowIfCancellationRequested();
        return run;
    }

    // On the HiGHS thread, at most every quarter second while a run is under way.
    private void Report(HighsProgress run)
    {
        if (Seconds < SolveProgress.QuietSeconds)
        {
            return;
        }

        _progress!.Report(new SolveProgress(
            _clock.Elapsed, HighsIterations + run.Iterations, Solves,
            double.IsNaN(run.Objective) ? null : run.Objective, double.IsNaN(run.MipGap) ? null : run.MipGap));
    }

    /// <summary>HiGHS's model status as a fit status (SPEC's statuses); every backend maps through this.</summary>
    public static SolveStatus StatusOf(HighsModelStatus status) => status switch
    {
        HighsModelStatus.Optimal or HighsModelStatus.ModelEmpty => SolveStatus.Optimal,
        HighsModelStatus.Infeasible => SolveStatus.Infeasible,
        HighsModelStatus.Unbounded or HighsModelStatus.UnboundedOrInfeasible => SolveStatus.Unbounded,
        HighsModelStatus.TimeLimit or HighsModelStatus.IterationLimit or HighsModelStatus.Interrupt or HighsModelStatus.SolutionLimit => SolveStatus.TimeLimit,
        _ => SolveStatus.Error,
    };

    private static HighsRunResult Map(HighsResult run, double[] x, double[] rowDual, double[] colDual)
    {
        var status = StatusOf(run.ModelStatus);
        var hasDual = status == SolveStatus.Optimal && run.HasDual;
        return new HighsRunResult(status, x, hasDual ? rowDual : null, hasDual ? colDual : null, run.ModelStatus, run.HasPrimal);
    }
}
