using System.Globalization;
using FitSpec.Lowering;
using FitSpec.Results;
using FitSpec.Solving;

namespace FitSpec.Analysis.Conflicts;

/// <summary>
/// Why a fit has no solution, in the user's terms: for an infeasible fit the conflicting constraints, for an
/// unbounded one the free direction. A solver's "unbounded or infeasible" is settled here: when no free
/// direction exists the feasible set is checked on its own, and an empty one is reported as infeasible.
/// </summary>
public sealed record NoSolutionDiagnosis(SolveStatus Status, string Detail, ConflictInfo? Conflict, FreeDirection? Direction)
{
    public static NoSolutionDiagnosis Of(LoweredFit lowered, Solution solution, CancellationToken cancellation)
    {
        ArgumentNullException.ThrowIfNull(lowered);
        ArgumentNullException.ThrowIfNull(solution);
        switch (solution.Status)
        {
            case SolveStatus.Infeasible:
                return Infeasible(lowered, solution, cancellation);
            case SolveStatus.Unbounded:
                if (DirectionFinder.Find(lowered.Program) is { } d && DirectionFinder.Describe(lowered.Design, d) is { } direction)
                {
                    return new NoSolutionDiagnosis(SolveStatus.Unbounded, UnboundedDetail(direction), null, direction);
                }

                if (FeasibilityProgram.IsInfeasible(new FeasibilityProgram(lowered.Program, lowered.Constraints).All, 10) == true)
                {
                    return Infeasible(lowered, solution, cancellation);
                }

                return new NoSolutionDiagnosis(SolveStatus.Unbounded, solution.StatusDetail ?? "the solver reports the objective unbounded, but no direction of unlimited decrease was found; report this fit", null, null);
            case SolveStatus.TimeLimit:
                return new NoSolutionDiagnosis(SolveStatus.TimeLimit, solution.StatusDetail ?? "the time limit was reached before any feasible point was found; no coefficients are reported (raise solve.time-limit)", null, null);
            default:
                return new NoSolutionDiagnosis(solution.Status, solution.StatusDetail ?? solution.Message, null, null);
        }
    }

    private static NoSolutionDiagnosis Infeasible(LoweredFit lowered, Solution solution, CancellationToken cancellation)
    {
        var conflict = ConflictFinder.Find(lowered, cancellation);
        if (conflict is not { Labels.Count: > 0 })
        {
            // No set of the user's constraints conflicts: the backend's own account (e.g. a loss's limit that
            // the data cannot meet) says more than the search's note.
            var general = solution.StatusDetail
                ?? "the constraints contradict each other (or the data): no coefficients satisfy them all" + (conflict?.Note is { } m ? "; " + m : "");
            return new NoSolutionDiagnosis(SolveStatus.Infeasible, general, solution.StatusDetail is null ? conflict : null, null);
        }

        var detail = $"the constraints contradict each other: {string.Join(", ", conflict.Labels.Select(l => $"'{l}'"))} cannot all hold"
            + (conflict.Irreducible ? (conflict.Labels.Count == 1 ? " (this one alone cannot hold with the data and model)" : " (the smallest such set: without any one of them the rest can hold)") : "")
            + (conflict.Note is { } n ? "; " + n : "")
            + (solution.StatusDetail is { } backend ? "; " + backend : "");
        return new NoSolutionDiagnosis(SolveStatus.Infeasible, detail, conflict, null);
    }

    private static string UnboundedDetail(FreeDirection direction) =>
        "the objective falls without limit as the coefficients move along "
        + string.Join(", ", direction.Components.Select(c => string.Create(CultureInfo.InvariantCulture, $"{c.Name} {c.Value:+0.######;-0.######}")))
        + ": nothing in the data or constraints fixes them";
}
