namespace FitSpec.Verification;

/// <summary>One user constraint re-checked at the solution, from its own definition.</summary>
public sealed record ConstraintCheck(
    int Index,
    string Label,
    string Kind,
    bool Active,
    double? Dual,
    double Violation,
    double Slack,
    string? Grid,
    double? FineGridWorst,
    int? FineGridPoints);

/// <summary>The independent evidence that the returned point is the answer.</summary>
public sealed record Verification(
    double ObjectiveRecomputed,
    double? SolverObjective,
    double? ObjectiveRelativeDifference,
    double MaxConstraintViolation,
    double? DualObjective,
    double? DualityGap,
    double? DualResidual,
    double? Stationarity,
    bool Passed,
    IReadOnlyList<string> Failures)
{
    /// <summary>What Stationarity measures: the normal equations (closed form) or the KKT conditions (iterative).</summary>
    public string StationarityKind { get; init; } = "Normal-equation residual";
}

/// <summary>Metrics over the unweighted residuals of the rows used.</summary>
public sealed record Metrics(int Observations, double Rmse, double Mae, double MaxAbsResidual, double R2, double? ResidualSd);

/// <summary>Stage 6's output: coefficients in the user's basis, residuals, checks.</summary>
public sealed record Checked(
    double[] Beta,
    double[] Residuals,
    double Objective,
    Metrics Metrics,
    IReadOnlyList<ConstraintCheck> Constraints,
    Verification Verification);
