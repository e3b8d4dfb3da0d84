using System.Diagnostics;
using FitSpec.Lowering;
using Highs.Native;

namespace FitSpec.Solving;

/// <summary>LP, QP and MILP through HiGHS; LPs go through their dual when that has fewer rows.</summary>
internal sealed class HighsFitSolver : IFitSolver
{
    public int Priority => 1000;

    public bool CanSolve(LoweredFit fit, SolveOptions options) => fit.Strategy is null;

    public Solution Solve(LoweredFit fit, SolveOptions options, CancellationToken cancellation)
    {
        var program = fit.Program;
        var useDual = program.Class == ProblemClass.LP && options.Formulation switch
        {
            Formulation.Dual => true,
            Formulation.Primal => false,
            _ => fit.PreferredForm switch
            {
                Spec.LpForm.Dual => true,
                Spec.LpForm.Primal => false,
                _ => LpDual.RowCount(program) < program.NumRows,
            },
        };
        var clock = Stopwatch.StartNew();
        if (!useDual)
        {
            var run = Run(HighsModels.From(program), options);
            return Map(run, run.ColValue, run.RowDual, run.ColDual, options, "primal", clock);
        }

        var dual = LpDual.Build(program);
        var dualRun = Run(dual.Model, options);
        var (x, rowDual, colDual) = dual.Recover(dualRun);
        return Map(dualRun, x, rowDual, colDual, options, $"dual ({dual.Model.NumRow} rows instead of {program.NumRows})", clock);
    }

    // QPs are first solved without HiGHS's default regularisation (which otherwise limits the answer to about
    // six digits); if that run fails to finish, the default is tried.
    internal static HighsResult Run(HighsModel model, SolveOptions options)
    {
        var quadratic = model.QValue is { Length: > 0 };
        var result = RunOnce(model, options, exactQp: quadratic);
        if (quadratic && result.ModelStatus is not (HighsModelStatus.Optimal or HighsModelStatus.Infeasible or HighsModelStatus.Unbounded or HighsModelStatus.TimeLimit))
        {
            result = RunOnce(model, options, exactQp: false);
        }

        return result;
    }

    private static HighsResult RunOnce(HighsModel model, SolveOptions options, bool exactQp)
    {
        using var highs = new HighsSolver();
        highs.SetOption("output_flag", false);
        highs.SetOption("threads", 1);
        if (options.TimeLimitSeconds is { } limit)
        {
            highs.SetOption("time_limit", limit);
        }

        switch (options.Method)
        {
            case Spec.SolveMethod.Simplex:
                highs.SetOption("solver", "simplex");
                break;
            case Spec.SolveMethod.Ipm:
                highs.SetOption("solver", "ipm");
                break;
        }

        // Tight tolerances: the answer is verified against the data afterwards.
        highs.SetOption("primal_feasibility_tolerance", 1e-9);
        highs.SetOption("dual_feasibility_tolerance", 1e-9);
        if (exactQp)
        {
            highs.SetOption("qp_regularization_value", 0.0);
        }

        highs.PassModel(model);
        return highs.Run();
    }

    private static Solution Map(HighsResult run, double[] x, double[] rowDual, double[] colDual, SolveOptions options, string formulation, Stopwatch clock)
    {
        var status = run.ModelStatus switch
        {
            HighsModelStatus.Optimal or HighsModelStatus.ModelEmpty => SolveStatus.Optimal,
            HighsModelStatus.Infeasible => SolveStatus.Infeasible,
            HighsModelStatus.Unbounded or HighsModelStatus.UnboundedOrInfeasible => SolveStatus.Unbounded,
            HighsModelStatus.TimeLimit or HighsModelStatus.IterationLimit or HighsModelStatus.Interrupt => SolveStatus.TimeLimit,
            _ => SolveStatus.Error,
        };
        var method = options.Method switch
        {
            Spec.SolveMethod.Ipm => "interior point",
            Spec.SolveMethod.Simplex => "simplex",
            _ => "HiGHS default (simplex for LP, active set for QP, branch and cut for MILP)",
        };
        var hasPoint = run.HasPrimal && status is SolveStatus.Optimal or SolveStatus.TimeLimit;
        return new Solution(
            status,
            hasPoint ? x : null,
            hasPoint && run.HasDual ? rowDual : null,
            hasPoint && run.HasDual ? colDual : null,
            $"HiGHS {HighsSolver.Version}",
            method,
            formulation,
            clock.Elapsed.TotalSeconds,
            run.SimplexIterations + run.IpmIterations + run.QpIterations,
            $"HiGHS model status: {run.ModelStatus}");
    }
}
