namespace FitSpec.Review;

/// <summary>How one item (a fit, a number, a rule) differs between the old and the new results.</summary>
public enum ChangeKind
{
    Unchanged,
    Changed,
    Added,
    Removed,
}

/// <summary>The non-numeric facts of a fit that a review compares.</summary>
public enum FitFact
{
    Name,
    Status,
    ProblemClass,
    SpecSha256,
    DataSha256,
}

/// <summary>A fact's old and new text (null: absent or null in the file).</summary>
public sealed record FactChange(FitFact Fact, ChangeKind Kind, string? Old, string? New);

/// <summary>
/// A coefficient, metric or the objective, old and new. Absolute is new − old; Relative is that over |old|,
/// null when old is 0 or either side has no value.
/// </summary>
public sealed record NumberChange(string Name, ChangeKind Kind, double? Old, double? New)
{
    public double? Absolute => Old is { } o && New is { } n ? n - o : null;

    public double? Relative => Old is { } o && New is { } n && o != 0 ? (n - o) / Math.Abs(o) : null;
}

/// <summary>An acceptance rule: Changed means its verdict flipped (PASS→FAIL or FAIL→PASS).</summary>
public sealed record RuleChange(string Rule, ChangeKind Kind, RuleVerdict? Old, RuleVerdict? New);

/// <summary>Everything compared for one fit, every item included (unchanged ones too, for --all).</summary>
public sealed record FitChange(
    string Name,
    ChangeKind Kind,
    ResultSummary? Old,
    ResultSummary? New,
    IReadOnlyList<FactChange> Facts,
    NumberChange Objective,
    IReadOnlyList<NumberChange> Coefficients,
    IReadOnlyList<NumberChange> Metrics,
    IReadOnlyList<RuleChange> Acceptance);

/// <summary>The comparison of two result sets (or two single results), fits in ordinal name order.</summary>
public sealed record ResultDiff(string OldSource, string NewSource, NumberTolerance Tolerance, IReadOnlyList<FitChange> Fits)
{
    public bool HasDifferences => Fits.Any(f => f.Kind != ChangeKind.Unchanged);

    public int Count(ChangeKind kind) => Fits.Count(f => f.Kind == kind);
}
