using System.Diagnostics;
using FitSpec.Lowering;
using Highs.Native;

namespace FitSpec.Solving.Sequential;

/// <summary>One subproblem's answer: HiGHS's status, the point and multipliers on the subproblem's variables and rows.</summary>
internal sealed record SubproblemResult(SolveStatus Status, double[] X, double[]? RowDual, double[]? ColDual, HighsModelStatus ModelStatus);

/// <summary>
/// Solves the subproblems of one sequential method with HiGHS, under one time budget for the whole
/// sequence, and counts what it did. One instance per fit solve (not shared between fits).
/// </summary>
internal sealed class SubproblemRunner
{
    private readonly SolveOptions _options;
    private readonly CancellationToken _cancellation;
    private readonly Stopwatch _clock = Stopwatch.StartNew();

    public SubproblemRunner(SolveOptions options, CancellationToken cancellation)
    {
        _options = options;
        _cancellation = cancellation;
    }

    public int Solves { get; private set; }

    public long HighsIterations { get; private set; }

    public double Seconds => _clock.Elapsed.TotalSeconds;

    /// <summary>True once the fit's time limit is spent.</summary>
    public bool OutOfTime => _options.TimeLimitSeconds is { } limit && Seconds >= limit;

    /// <param name="program">The subproblem.</param>
    /// <param name="viaDual">
    /// For an LP: whether to solve it through its dual (the l1 start: yes; the minimax LPs: no, being faster as
    /// they are); null for whichever has fewer rows. The user's solve.form overrides it.
    /// </param>
    public SubproblemResult Solve(FitProgram program, bool? viaDual = null)
    {
        _cancellation.ThrowIfCancellationRequested();
        Solves++;
        var useDual = program.Class == ProblemClass.LP && _options.Formulation switch
        {
            Formulation.Dual => true,
            Formulation.Primal => false,
            _ => viaDual ?? LpDual.RowCount(program) < program.NumRows,
        };
        if (useDual)
        {
            var dual = LpDual.Build(program);
            var run = Run(dual.Model, isLp: true, program);
            if (run.ModelStatus == HighsModelStatus.Optimal)
            {
                var (x, rowDual, colDual) = dual.Recover(run);
                return Map(run, x, rowDual, colDual);
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
        HighsResult direct;
        try
        {
            direct = Run(HighsModels.From(scaled), program.Class == ProblemClass.LP, scaled);
        }
        catch (InvalidOperationException)
        {
            // HiGHS refuses a model whose numbers it cannot take (the binding reports it this way).
            return new SubproblemResult(SolveStatus.Error, [], null, null, HighsModelStatus.ModelError);
        }

        return Map(direct, direct.ColValue, direct.RowDual.Select(y => y / sigma).ToArray(), direct.ColDual.Select(z => z / sigma).ToArray());
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
    private HighsResult Run(HighsModel model, bool isLp, FitProgram program)
    {
        var result = RunOnce(model, isLp, exactQp: !isLp);
        if (isLp || result.ModelStatus is HighsModelStatus.Infeasible or HighsModelStatus.Unbounded or HighsModelStatus.TimeLimit)
        {
            return result;
        }

        var residual = result.ModelStatus == HighsModelStatus.Optimal ? Stationarity(program, result) : double.PositiveInfinity;
        if (residual <= 1e-9)
        {
            return result;
        }

        var regularised = RunOnce(model, isLp, exactQp: false);
        var other = regularised.ModelStatus == HighsModelStatus.Optimal ? Stationarity(program, regularised) : double.PositiveInfinity;
        return other < residual || result.ModelStatus != HighsModelStatus.Optimal ? regularised : result;
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
            scale = Math.Max(scale, Math.Abs(program.Cost[j]) + Math.Abs(qx[j]));
        }

        return worst / scale;
    }

    private HighsResult RunOnce(HighsModel model, bool isLp, bool exactQp)
    {
        using var highs = new HighsSolver();
        highs.SetOption("output_flag", false);
        highs.SetOption("threads", 1);
        if (_options.TimeLimitSeconds is { } limit)
        {
            highs.SetOption("time_limit", Math.Max(limit - Seconds, 1e-3));
        }

        // The user's method choice applies to the LPs of the sequence; QPs go to HiGHS's QP solver.
        if (isLp)
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
        var run = highs.Run();
        HighsIterations += run.SimplexIterations + run.IpmIterations + run.QpIterations;
        return run;
    }

    private static SubproblemResult Map(HighsResult run, double[] x, double[] rowDual, double[] colDual)
    {
        var status = run.ModelStatus switch
        {
            HighsModelStatus.Optimal or HighsModelStatus.ModelEmpty => SolveStatus.Optimal,
            HighsModelStatus.Infeasible => SolveStatus.Infeasible,
            HighsModelStatus.Unbounded or HighsModelStatus.UnboundedOrInfeasible => SolveStatus.Unbounded,
            HighsModelStatus.TimeLimit or HighsModelStatus.IterationLimit or HighsModelStatus.Interrupt => SolveStatus.TimeLimit,
            _ => SolveStatus.Error,
        };
        var hasDual = status == SolveStatus.Optimal && run.HasDual;
        return new SubproblemResult(status, x, hasDual ? rowDual : null, hasDual ? colDual : null, run.ModelStatus);
    }
}
