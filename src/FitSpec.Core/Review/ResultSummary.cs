namespace FitSpec.Review;

/// <summary>
/// What a review compares of one &lt;name&gt;.result.json: identity, outcome, the numbers and the verdicts.
/// Numbers are null where the file holds null (a value that was not finite or not computed).
/// </summary>
public sealed record ResultSummary(
    string File,
    string Name,
    string Status,
    string? ProblemClass,
    double? Objective,
    IReadOnlyList<NamedNumber> Coefficients,
    IReadOnlyList<NamedNumber> Metrics,
    IReadOnlyList<RuleVerdict> Acceptance,
    string? SpecSha256,
    string? DataSha256);

/// <summary>A coefficient or metric as stored, in file order.</summary>
public sealed record NamedNumber(string Name, double? Value);

/// <summary>One acceptance rule's stored outcome: the rule text, its left-hand value and whether it passed.</summary>
public sealed record RuleVerdict(string Rule, double? Value, bool Passed);

/// <summary>Every result of one folder, keyed by fit name (ordinal order).</summary>
public sealed record ResultSet(string Source, IReadOnlyDictionary<string, ResultSummary> Fits);
