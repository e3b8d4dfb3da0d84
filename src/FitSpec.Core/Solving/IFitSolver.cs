using FitSpec.Lowering;

namespace FitSpec.Solving;

/// <summary>A backend that solves a lowered fit.</summary>
public interface IFitSolver
{
    bool CanSolve(LoweredFit fit, SolveOptions options);

    Solution Solve(LoweredFit fit, SolveOptions options, CancellationToken cancellation);
}

/// <summary>Stage 5 entry point: picks the backend (closed form where exact, else HiGHS) and solves.</summary>
public static class Solver
{
    private static readonly IFitSolver[] Backends = [new QrLeastSquares(), new HighsFitSolver()];

    public static Solution Solve(LoweredFit fit, SolveOptions options, CancellationToken cancellation = default)
    {
        ArgumentNullException.ThrowIfNull(fit);
        ArgumentNullException.ThrowIfNull(options);
        return Backends.First(b => b.CanSolve(fit, options)).Solve(fit, options, cancellation);
    }

    public static string HighsVersion => Highs.Native.HighsSolver.Version;
}
