namespace FitSpec.Results;

/// <summary>
/// The per-row numbers the plots are drawn from: the rows used, in data order. Input is the model's one
/// input column when it has exactly one (then InputValues and the fitted curve on a fine grid over the data
/// range are given); with several inputs both are null and the plot shows fitted against observed.
/// </summary>
public sealed record ResidualSeries(
    string Response,
    string? Input,
    double[]? InputValues,
    double[] Observed,
    double[] Fitted,
    double[] Residuals,
    int[] Lines,
    double[]? CurveX,
    double[]? CurveY);

/// <summary>A horizontal line a residual plot draws at ±Value (a Huber width, a band, a barrier limit).</summary>
public sealed record ResidualGuide(string Label, double Value);

/// <summary>The loss's penalty φ(r) sampled over the residual range, for the histogram overlay.</summary>
public sealed record LossCurve(string Loss, double[] R, double[] Phi);

/// <summary>Leverage h_ii of the l2 fits: the highest rows, their mean p/n and the usual 2p/n flag level.</summary>
public sealed record LeverageSummary(double Mean, double Threshold, IReadOnlyList<LeverageRow> Highest);

public sealed record LeverageRow(int Row, int Line, double Value);

/// <summary>An active constraint's dual read as a sentence.</summary>
public sealed record DualReading(string Label, double Dual, string Sentence);

/// <summary>
/// LP sensitivity from HiGHS's ranging. For a user constraint: the interval of its constant side over which
/// its dual stays valid, and the objective at either end. For a plain coefficient: the interval of a linear
/// cost c·b that keeps the solution optimal.
/// </summary>
public sealed record RangingInfo(IReadOnlyList<BoundRange> Constraints, IReadOnlyList<CostRange> Coefficients, string? Note);

public sealed record BoundRange(string Label, double Value, double Low, double High, double ObjectiveAtLow, double ObjectiveAtHigh);

public sealed record CostRange(string Name, double Low, double High);

/// <summary>
/// Coefficient uncertainty. Classical: standard errors of an unconstrained weighted l2 fit (s·sqrt of the
/// diagonal of (X'WX)⁻¹). Bootstrap: percentile intervals from case resampling with the given seed.
/// </summary>
public sealed record UncertaintyInfo(
    IReadOnlyList<StandardError>? Classical,
    BootstrapInfo? Bootstrap);

public sealed record StandardError(string Name, double Value, double StdError, double TValue);

public sealed record BootstrapInfo(
    int Replicates,
    int Seed,
    int Succeeded,
    double Level,
    IReadOnlyList<BootstrapInterval> Intervals,
    string? Note);

public sealed record BootstrapInterval(string Name, double Value, double Low, double High, double StdDev);
