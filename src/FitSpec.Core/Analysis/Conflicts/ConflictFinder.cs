using System.Diagnostics;
using FitSpec.Lowering;
using FitSpec.Results;

namespace FitSpec.Analysis.Conflicts;

/// <summary>
/// For an infeasible fit: the smallest set of the user's own constraints that cannot hold together. HiGHS's
/// irreducible infeasible subsystem of the feasible set names the candidates (its rows and bounds map back to
/// the constraints that made them); a deletion pass over those then drops every constraint whose removal
/// leaves the rest still infeasible, so that each one left is needed (irreducible at the level of the
/// user's labels, which a constraint lowered to many rows would otherwise not be).
/// </summary>
public static class ConflictFinder
{
    /// <summary>Programs with more rows than this are not searched (each step re-solves the feasible set).</summary>
    public const int MaxRows = 200_000;

    /// <summary>Time for the whole search; a search cut short says its set may not be the smallest.</summary>
    public static readonly TimeSpan Budget = TimeSpan.FromSeconds(30);

    public static ConflictInfo? Find(LoweredFit lowered, CancellationToken cancellation)
    {
        ArgumentNullException.ThrowIfNull(lowered);
        var constraints = lowered.Constraints;
        var program = lowered.Program;
        if (constraints.Count == 0)
        {
            return null;
        }

        if (program.NumRows > MaxRows)
        {
            return new ConflictInfo([], false, $"not searched: the program has {program.NumRows:N0} rows, more than the {MaxRows:N0} the search takes on");
        }

        var clock = Stopwatch.StartNew();
        double Left() => Math.Max(0.5, (Budget - clock.Elapsed).TotalSeconds);
        var feasible = new FeasibilityProgram(program, constraints);
        var all = Enumerable.Range(0, constraints.Count).ToHashSet();
        if (FeasibilityProgram.IsInfeasible(feasible.Keeping(all), Left()) != true)
        {
            // The constraints hold together once integrality goes: what conflicts is the count limit itself.
            return new ConflictInfo([], false, program.HasIntegers
                ? "the constraints can all hold when the coefficients may be any real numbers; the conflict involves the count limit on non-zero coefficients"
                : "the constraints alone were found satisfiable on a second look, so no conflicting set could be isolated (the problem is at the edge of feasibility; loosen a constraint slightly)");
        }

        cancellation.ThrowIfCancellationRequested();
        var (candidates, withModelRows) = FromSubsystem(lowered, feasible, Left());
        if (candidates.Count == 0 || FeasibilityProgram.IsInfeasible(feasible.Keeping(candidates), Left()) != true)
        {
            candidates = all;
        }

        var irreducible = true;
        foreach (var k in candidates.Order().ToList())
        {
            cancellation.ThrowIfCancellationRequested();
            if (clock.Elapsed > Budget)
            {
                irreducible = false;
                break;
            }

            var without = candidates.Where(c => c != k).ToHashSet();
            switch (without.Count == 0 ? false : FeasibilityProgram.IsInfeasible(feasible.Keeping(without), Left()))
            {
                case true:
                    candidates = without;
                    break;
                case null:
                    irreducible = false;
                    break;
            }
        }

        var labels = candidates.Order().Select(k => constraints[k].Spec.Label).ToList();
        var note = !irreducible
            ? "the search was cut short (time or an undecided solve): the set conflicts, but may not be the smallest"
            : withModelRows ? "together with the model's own limits (such as a penalty's or the count limit's rows)" : null;
        return new ConflictInfo(labels, irreducible, note);
    }

    // The user constraints whose rows or variable bounds lie in HiGHS's subsystem; whether it needed other rows too.
    private static (HashSet<int> Constraints, bool WithModelRows) FromSubsystem(LoweredFit lowered, FeasibilityProgram feasible, double seconds)
    {
        var subsystem = FeasibilityProgram.Subsystem(feasible.All, seconds);
        if (subsystem is null)
        {
            return ([], false);
        }

        var rows = subsystem.Rows.ToHashSet();
        var columns = subsystem.Columns.ToHashSet();
        var found = new HashSet<int>();
        for (var k = 0; k < lowered.Constraints.Count; k++)
        {
            var c = lowered.Constraints[k];
            if (c.Rows.Any(rows.Contains) || c.VarBounds.Any(v => columns.Contains(v.Var)))
            {
                found.Add(k);
            }
        }

        var origin = lowered.Program.RowOrigin;
        var withModelRows = rows.Any(r => origin[r].Kind is OriginKind.Penalty);
        return (found, withModelRows);
    }
}
