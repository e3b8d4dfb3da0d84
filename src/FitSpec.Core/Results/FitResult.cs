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

    /// <summary>Per-row numbers for the plots (null when nothing was solved).</summary>
    public ResidualSeries? Series { get; init; }

    /// <summary>Lines the residual plot draws at ±value: the loss's width, a residual band, a barrier limit.</summary>
    public IReadOnlyList<ResidualGuide> Guides { get; init; } = [];

    /// <summary>The loss's φ(r) over the residual range (null for fits without a loss).</summary>
    public LossCurve? LossCurve { get; init; }

    /// <summary>For robust losses: data-file lines of the observations outside the loss's width.</summary>
    public IReadOnlyList<int> OutsideWidthLines { get; init; } = [];

    /// <summary>Leverage of the rows (l2 fits only).</summary>
    public LeverageSummary? Leverage { get; init; }

    /// <summary>Each active constraint's dual as a sentence.</summary>
    public IReadOnlyList<DualReading> DualReadings { get; init; } = [];

    /// <summary>LP cost and bound ranging (LP fits only).</summary>
    public RangingInfo? Ranging { get; init; }

    /// <summary>Classical standard errors and bootstrap intervals, where computed.</summary>
    public UncertaintyInfo? Uncertainty { get; init; }

    /// <summary>For an infeasible fit: the smallest set of the user's constraints that cannot hold together.</summary>
    public ConflictInfo? Conflict { get; init; }

    /// <summary>For an unbounded fit: the coefficients along which the objective falls without limit.</summary>
    public FreeDirection? FreeDirection { get; init; }

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
    string OperatingSystem)
{
    /// <summary>The source commit the tool was built from, when known.</summary>
    public string? Commit { get; init; }

    /// <summary>The command that produced the result (scheduling options left out).</summary>
    public string CommandLine { get; init; } = "";

    /// <summary>UTC time of the run; only with --stamp, so that files are otherwise byte-identical.</summary>
    public string? Stamp { get; init; }
}

/// <summary>
/// Constraints (by label, in spec order) that cannot all hold; Irreducible when dropping any one of them was
/// checked to leave the rest satisfiable. Note says what else is involved or why the search stopped.
/// </summary>
public sealed record ConflictInfo(IReadOnlyList<string> Labels, bool Irreducible, string? Note);

/// <summary>A direction (per coefficient, largest component 1) along which the objective decreases for ever.</summary>
public sealed record FreeDirection(IReadOnlyList<CoefficientValue> Components);

public sealed record ErrorEntry(string File, int? Line, int? Column, string? Field, string Message);
