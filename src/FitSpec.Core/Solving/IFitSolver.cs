using FitSpec.Lowering;

namespace FitSpec.Solving;

/// <summary>A backend that solves a lowered fit. Backends are found in this assembly and tried by Priority.</summary>
public interface IFitSolver
{
    /// <summary>Lower runs first; the general HiGHS backend is last.</summary>
    int Priority { get; }

    bool CanSolve(LoweredFit fit, SolveOptions options);

    Solution Solve(LoweredFit fit, SolveOptions options, CancellationToken cancellation);
}

/// <summary>Stage 5 entry point: picks the backend (closed form where exact, else HiGHS) and solves.</summary>
public static class Solver
{
    private static readonly IFitSolver[] Backends = typeof(Solver).Assembly.GetTypes()
        .Where(t => typeof(IFitSolver).IsAssignableFrom(t) && t is { IsAbstract: false, IsInterface: false })
        .Select(t => (IFitSolver)Activator.CreateInstance(t)!)
        .OrderBy(b => b.Priority)
        .ThenBy(b => b.GetType().FullName, StringComparer.Ordinal)
        .ToArray();

    public static Solution Solve(LoweredFit fit, SolveOptions options, CancellationToken cancellation = default)
    {
        ArgumentNullException.ThrowIfNull(fit);
        ArgumentNullException.ThrowIfNull(options);
        return Backends.First(b => b.CanSolve(fit, options)).Solve(fit, options, cancellation);
    }

    public static string HighsVersion => Highs.Native.HighsSolver.Version;
}
