using FitSpec.Verification;

namespace FitSpec.Results;

/// <summary>
/// Everything a report shows about one fit. Rendering reads only this (and never re-solves). Null members
/// are absent when the fit did not get that far (e.g. an invalid spec has only Errors).
/// </summary>
public sealed record FitResult(
    string Name,
    string Status,
    string? StatusDetail,
    string SpecFile,
    string? Title,
    string? Description,
    FitStatement? Statement,
    ProblemInfo? Problem,
    double? Objective,
    IReadOnlyList<CoefficientValue> Coefficients,
    DataInfo? Data,
    Metrics? Metrics,
    IReadOnlyList<ConstraintCheck> Constraints,
    IReadOnlyList<AcceptanceResult> Acceptance,
    Verification.Verification? Verification,
    IReadOnlyList<LargestResidual> LargestResiduals,
    IReadOnlyList<Lowering.LoweringNote> Lowering,
    Provenance Provenance,
    IReadOnlyList<ErrorEntry> Errors)
{
    /// <summary>
    /// The observations a local method treated as outliers (truncated-l2: |e| above the cap), as data-file
    /// line numbers (the header is line 1), in row order; empty for every other fit.
    /// </summary>
    public IReadOnlyList<int> OutlierLines { get; init; } = [];

    /// <summary>SPEC exit-code semantics for this fit alone.</summary>
    public int ExitCode => Status switch
    {
        "optimal" or "local-optimum" => Acceptance.Any(a => !a.Passed) ? 1 : 0,
        "error" when Problem is null => 2,
        _ => 3,
    };
}

/// <summary>The fit in plain mathematics, as the user wrote it.</summary>
public sealed record FitStatement(
    string Response,
    string Model,
    string Loss,
    string LossFormula,
    IReadOnlyList<string> Penalties,
    IReadOnlyList<string> Constraints,
    string? Weight,
    string? Filter);

public sealed record ProblemInfo(
    string Class,
    int Variables,
    int Rows,
    int Nonzeros,
    string Solver,
    string Method,
    string Formulation,
    double SolveSeconds,
    long Iterations)
{
    /// <summary>For MILPs: HiGHS's relative gap between the incumbent and the proven bound.</summary>
    public double? MipGap { get; init; }
}

public sealed record CoefficientValue(string Name, double Value, string Term);

public sealed record DataInfo(string File, string Sha256, int Rows, int Used, int DroppedMissing, int DroppedFilter);

public sealed record AcceptanceResult(string Rule, double? Value, bool Passed, string? Error);

/// <summary>A row with one of the largest residuals (Line is the data-file line).</summary>
public sealed record LargestResidual(int Row, int Line, double Observed, double Fitted, double Residual);

public sealed record Provenance(
    string SpecSha256,
    string? DataSha256,
    string ToolVersion,
    string Solver,
    string Runtime,
    string OperatingSystem);

public sealed record ErrorEntry(string File, int? Line, int? Column, string? Field, string Message);
