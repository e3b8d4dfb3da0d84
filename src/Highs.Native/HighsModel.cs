namespace Highs.Native;

/// <summary>
/// A linear, quadratic or mixed-integer model in the column-wise form HiGHS takes:
/// minimise offset + cost'x + ½ x'Qx subject to rowLower ≤ Ax ≤ rowUpper, colLower ≤ x ≤ colUpper.
/// A is compressed sparse column (AStart has NumCol+1 entries); Q, when present, is the lower
/// triangle column-wise (HiGHS's triangular format), or equivalently the upper triangle row-wise.
/// Infinite bounds are double.PositiveInfinity / NegativeInfinity.
/// </summary>
public sealed record HighsModel(
    int NumCol,
    int NumRow,
    double Offset,
    double[] ColCost,
    double[] ColLower,
    double[] ColUpper,
    double[] RowLower,
    double[] RowUpper,
    int[] AStart,
    int[] AIndex,
    double[] AValue,
    int[]? QStart = null,
    int[]? QIndex = null,
    double[]? QValue = null,
    bool[]? Integer = null);

/// <summary>HiGHS's model status codes, as its C API numbers them.</summary>
public enum HighsModelStatus
{
    NotSet = 0,
    LoadError = 1,
    ModelError = 2,
    PresolveError = 3,
    SolveError = 4,
    PostsolveError = 5,
    ModelEmpty = 6,
    Optimal = 7,
    Infeasible = 8,
    UnboundedOrInfeasible = 9,
    Unbounded = 10,
    ObjectiveBound = 11,
    ObjectiveTarget = 12,
    TimeLimit = 13,
    IterationLimit = 14,
    Unknown = 15,
    SolutionLimit = 16,
    Interrupt = 17,
}

/// <summary>What a run returned: status, primal and dual values (HiGHS's sign convention), and timing.</summary>
public sealed record HighsResult(
    int RunStatus,
    HighsModelStatus ModelStatus,
    double ObjectiveValue,
    double[] ColValue,
    double[] ColDual,
    double[] RowValue,
    double[] RowDual,
    double RunTimeSeconds,
    int SimplexIterations,
    int IpmIterations,
    int QpIterations,
    double MipGap,
    bool HasPrimal,
    bool HasDual);
