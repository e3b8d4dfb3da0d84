namespace FitSpec.Solving;

public enum SolveStatus
{
    Optimal,
    Infeasible,
    Unbounded,
    TimeLimit,
    Error,
}

/// <summary>How the solver was asked to work on one fit.</summary>
public sealed record SolveOptions(Spec.SolveMethod Method, double? TimeLimitSeconds, Formulation Formulation = Formulation.Auto);

/// <summary>Which LP to hand the solver: the program as lowered, its dual (fewer rows for l1-type fits), or the smaller.</summary>
public enum Formulation
{
    Auto,
    Primal,
    Dual,
}

/// <summary>
/// Stage 5's output, on the program's variables and rows. RowDual/ColDual follow the convention
/// ∂(optimal objective)/∂(bound): ≥ 0 at an active lower bound, ≤ 0 at an active upper bound.
/// Raw, when given, holds the user's coefficients β refined directly (otherwise β = M θ).
/// </summary>
public sealed record Solution(
    SolveStatus Status,
    double[]? X,
    double[]? RowDual,
    double[]? ColDual,
    string Solver,
    string Method,
    string Formulation,
    double Seconds,
    long Iterations,
    string Message,
    double[]? Raw = null)
{
    public bool HasPoint => X is not null;
}
