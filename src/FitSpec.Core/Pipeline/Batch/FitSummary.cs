using FitSpec.Diagnostics;
using FitSpec.Results;

namespace FitSpec.Pipeline.Batch;

/// <summary>
/// What a batch shows about one fit (console lines, summary table, index pages), small enough to keep in
/// the cache so that a fit that is not solved again is still reported in full.
/// </summary>
public sealed record FitSummary(
    string Name,
    string? Title,
    string SpecFile,
    string Status,
    string? StatusDetail,
    int ExitCode,
    int AcceptancePassed,
    int AcceptanceTotal,
    int? Observations,
    double? Rmse,
    double? MaxAbsResidual,
    double? R2,
    double? Objective,
    IReadOnlyList<string> Errors)
{
    /// <summary>True when the fit reached an optimum (local or global).</summary>
    public bool Solved => Status is "optimal" or "local-optimum";

    public bool AcceptanceFailed => AcceptancePassed < AcceptanceTotal;

    public static FitSummary Of(FitResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        var m = result.Metrics;
        return new FitSummary(
            result.Name, result.Title, result.SpecFile, result.Status, result.StatusDetail, result.ExitCode,
            result.Acceptance.Count(a => a.Passed), result.Acceptance.Count,
            m?.Observations, m?.Rmse, m?.MaxAbsResidual, m?.R2, result.Objective,
            result.Errors.Select(e => new Diagnostic(e.File, e.Line, e.Column, e.Field, e.Message).ToString()).ToList());
    }
}
