using FitSpec.Design;
using FitSpec.Spec;

namespace FitSpec.Lowering;

/// <summary>How one spec item was lowered, for the report's lowering table.</summary>
public sealed record LoweringNote(string Item, string Label, string How);

/// <summary>
/// A user constraint after lowering: which rows (or variable bounds) carry it, so that activity and duals
/// can be reported against the user's own text. Scale converts a bound on θ back to the user's units.
/// </summary>
public sealed record LoweredConstraint(
    int Index,
    ConstraintSpec Spec,
    IReadOnlyList<int> Rows,
    IReadOnlyList<(int Var, double Scale)> VarBounds,
    string? Grid,
    ShapeCheck? Shape)
{
    /// <summary>For a relation constraint: the relation as parsed once when lowered.</summary>
    public Expressions.LinearRelation? Relation { get; init; }

    /// <summary>An equality reports d(objective)/d(constant side); an inequality the fall per unit relaxation.</summary>
    public bool IsEquality { get; init; }
}

/// <summary>What the verification needs to re-check a shape constraint on a finer grid.</summary>
public sealed record ShapeCheck(ShapeKind Kind, string Input, double From, double To, int GridPoints, IReadOnlyDictionary<string, double> At);

/// <summary>
/// The unconstrained least-squares form: minimise Σ w (y - Xθ)² + Σ (ridge row · θ)². Ridge row k over θ is
/// RidgeRaw[k] (a row over the user's coefficients β: √λ β_j, or √λ times a k-th difference) written through M.
/// </summary>
public sealed record LeastSquaresForm(IReadOnlyList<Entry[]> RidgeRows, IReadOnlyList<Entry[]> RidgeRaw);

/// <summary>
/// A way of solving that one program solve does not cover (a sequence of QPs, a local method, support
/// enumeration): set by the loss or penalty unit that needs it, recognised by the backend that runs it.
/// With a strategy, Program holds everything but the part the strategy handles (e.g. the constraints and
/// penalties without the loss).
/// </summary>
public interface ISolveStrategy
{
    ProblemClass Class { get; }
}

/// <summary>Stage 4's output: the program, and the map from its rows back to the user's items.</summary>
public sealed record LoweredFit(
    FitSpecDocument Spec,
    Design.Design Design,
    FitProgram Program,
    ProblemClass Class,
    IReadOnlyList<LoweredConstraint> Constraints,
    IReadOnlyList<LoweringNote> Notes,
    LeastSquaresForm? ClosedForm,
    IReadOnlyList<IReadOnlyList<int>> PenaltyTargets,
    ISolveStrategy? Strategy = null,
    LpForm PreferredForm = LpForm.Auto);
