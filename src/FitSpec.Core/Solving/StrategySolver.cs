using FitSpec.Lowering;

namespace FitSpec.Solving;

/// <summary>
/// A backend for one kind of <see cref="ISolveStrategy"/>: recognises the strategy and hands it, typed, to the
/// method, with a HiGHS runner that carries the fit's time budget.
/// </summary>
internal abstract class StrategySolver<TStrategy> : IFitSolver
    where TStrategy : class, ISolveStrategy
{
    public virtual int Priority => 500;

    public bool CanSolve(LoweredFit fit, SolveOptions options) => fit?.Strategy is TStrategy;

    public Solution Solve(LoweredFit fit, SolveOptions options, CancellationToken cancellation)
    {
        ArgumentNullException.ThrowIfNull(fit);
        ArgumentNullException.ThrowIfNull(options);
        return Solve(fit, (TStrategy)fit.Strategy!, options, new HighsRunner(options, cancellation));
    }

    protected abstract Solution Solve(LoweredFit fit, TStrategy strategy, SolveOptions options, HighsRunner runner);
}
