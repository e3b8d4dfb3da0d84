using FitSpec.Lowering;

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
public sealed record SolveOptions(Spec.SolveMethod Method, double? TimeLimitSeconds, Formulation Formulation = Formulation.Auto)
{
    /// <summary>
    /// Where a long solve reports how it stands (see <see cref="SolveProgress"/>); when null, the sink of the
    /// enclosing <see cref="SolveProgressScope"/>, if any. Reports come from the solving thread.
    /// </summary>
    public IProgress<SolveProgress>? Progress { get; init; }
}

/// <summary>
/// How a fit's solve stands, reported while it runs once it has taken longer than
/// <see cref="SolveProgress.QuietSeconds"/>: the time since its solve began, the HiGHS iterations of all its
/// runs so far, how many programs it has handed HiGHS, and, when HiGHS reports them, the current objective
/// (a MILP's best point) and a MILP's relative gap.
/// </summary>
public sealed record SolveProgress(TimeSpan Elapsed, long Iterations, int Programs, double? Objective, double? MipGap)
{
    /// <summary>A solve shorter than this reports nothing.</summary>
    public const double QuietSeconds = 2;
}

/// <summary>
/// The progress sink for the solves started inside a scope on this logical thread (and the work it starts),
/// for callers that reach the solver through stages that do not pass one on, such as a batch's fits.
/// </summary>
public static class SolveProgressScope
{
    private static readonly AsyncLocal<IProgress<SolveProgress>?> Ambient = new();

    public static IProgress<SolveProgress>? Current => Ambient.Value;

    /// <summary>Makes <paramref name="sink"/> current until the returned scope is disposed.</summary>
    public static IDisposable Enter(IProgress<SolveProgress>? sink)
    {
        var previous = Ambient.Value;
        Ambient.Value = sink;
        return new Restore(previous);
    }

    private sealed class Restore(IProgress<SolveProgress>? previous) : IDisposable
    {
        public void Dispose() => Ambient.Value = previous;
    }
}

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
    /// <summary>For iterative methods: the KKT (first-order optimality) residual at the returned point.</summary>
    public double? KktResidual { get; init; }

    /// <summary>For local methods: the rows (0-based) treated as outliers.</summary>
    public IReadOnlyList<int>? Outliers { get; init; }

    /// <summary>For MILPs: the relative gap between the best point and the proven bound.</summary>
    public double? MipGap { get; init; }

    /// <summary>Whether the returned point provably minimises the fit (false for local methods).</summary>
    public bool GlobalOptimum { get; init; } = true;

    /// <summary>
    /// The program this point and these duals belong to, when a backend solved a program other than the
    /// lowered one (the last of a sequence, a re-solve on a chosen support). It keeps the lowered program's
    /// variables and rows at their indices and may append more.
    /// </summary>
    public FitProgram? SolvedProgram { get; init; }

    /// <summary>False when the solved program's objective is a model of the fit's objective, not equal to it.</summary>
    public bool ObjectiveComparable { get; init; } = true;

    /// <summary>Extra lowering notes from the solve (e.g. "12 Newton steps").</summary>
    public IReadOnlyList<Lowering.LoweringNote> Notes { get; init; } = [];

    /// <summary>
    /// The user-facing explanation of the status, when the backend has a more precise one than the generic
    /// text (e.g. the evidence that no point satisfies a loss's domain).
    /// </summary>
    public string? StatusDetail { get; init; }

    public bool HasPoint => X is not null;
}
