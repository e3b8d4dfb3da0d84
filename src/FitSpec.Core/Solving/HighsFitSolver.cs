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
        bool? viaDual = fit.PreferredForm switch
        {
            Spec.LpForm.Dual => true,
            Spec.LpForm.Primal => false,
            _ => null,
        };
        var clock = Stopwatch.StartNew();
        var runner = new HighsRunner(options, cancellation);
        var run = runner.Solve(program, viaDual);
        var formulation = runner.UsedDual ? $"dual ({runner.DualRows} rows instead of {program.NumRows})" : "primal";
        return Map(run, runner, options, formulation, clock);
    }

    private static Solution Map(HighsRunResult run, HighsRunner runner, SolveOptions options, string formulation, Stopwatch clock)
    {
        var method = runner.UsedDual && runner.UsedInteriorPoint ? "interior point with crossover (auto: large dual LP)" : options.Method switch
        {
            Spec.SolveMethod.Ipm => "interior point",
            Spec.SolveMethod.Simplex => "simplex",
            _ => "HiGHS default (simplex for LP, active set for QP, branch and cut for MILP)",
        };
        var hasPoint = run.X.Length > 0 && run.Status is SolveStatus.Optimal or SolveStatus.TimeLimit && run.HasPrimal;
        return new Solution(
            run.Status,
            hasPoint ? run.X : null,
            hasPoint ? run.RowDual : null,
            hasPoint ? run.ColDual : null,
            $"HiGHS {HighsSolver.Version}",
            method,
            formulation,
            clock.Elapsed.TotalSeconds,
            runner.HighsIterations,
            $"HiGHS model status: {run.ModelStatus}");
    }
}
