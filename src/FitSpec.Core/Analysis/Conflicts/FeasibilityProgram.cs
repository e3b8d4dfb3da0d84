using FitSpec.Lowering;
using FitSpec.Solving;
using Highs.Native;

namespace FitSpec.Analysis.Conflicts;

/// <summary>
/// The lowered program's feasible set alone (no objective, no integrality), with any chosen set of the user's
/// constraints left out: what the conflict search asks "can these hold together?" of.
/// </summary>
internal sealed class FeasibilityProgram
{
    private readonly FitProgram _base;
    private readonly IReadOnlyList<LoweredConstraint> _constraints;

    public FeasibilityProgram(FitProgram program, IReadOnlyList<LoweredConstraint> constraints)
    {
        _constraints = constraints;
        _base = program with
        {
            Cost = new double[program.NumVars],
            Offset = 0,
            QStart = [],
            QIndex = [],
            QValue = [],
            Integer = new bool[program.NumVars],
        };
    }

    /// <summary>The whole feasible set (every user constraint kept).</summary>
    public FitProgram All => _base;

    /// <summary>The program with only the user constraints at the given positions of the lowered list.</summary>
    public FitProgram Keeping(IReadOnlySet<int> kept)
    {
        var rowLower = (double[])_base.RowLower.Clone();
        var rowUpper = (double[])_base.RowUpper.Clone();
        var lower = (double[])_base.Lower.Clone();
        var upper = (double[])_base.Upper.Clone();
        for (var k = 0; k < _constraints.Count; k++)
        {
            if (kept.Contains(k))
            {
                continue;
            }

            foreach (var r in _constraints[k].Rows)
            {
                rowLower[r] = double.NegativeInfinity;
                rowUpper[r] = double.PositiveInfinity;
            }

            // A constraint only turns a variable's bounds into its own when the variable was free (BoundsUnit).
            foreach (var (v, _) in _constraints[k].VarBounds)
            {
                lower[v] = double.NegativeInfinity;
                upper[v] = double.PositiveInfinity;
            }
        }

        return _base with { RowLower = rowLower, RowUpper = rowUpper, Lower = lower, Upper = upper };
    }

    /// <summary>True: no point satisfies the program; false: one does; null: HiGHS could not tell in time.</summary>
    public static bool? IsInfeasible(FitProgram program, double seconds)
    {
        using var highs = Open(program, seconds);
        var status = highs.Run().ModelStatus;
        return status switch
        {
            HighsModelStatus.Infeasible => true,
            HighsModelStatus.Optimal or HighsModelStatus.ModelEmpty => false,
            _ => null,
        };
    }

    /// <summary>HiGHS's irreducible infeasible subsystem of the program (null when it computes none).</summary>
    public static HighsIis? Subsystem(FitProgram program, double seconds)
    {
        using var highs = Open(program, seconds);
        return highs.GetIis();
    }

    private static HighsSolver Open(FitProgram program, double seconds) => Open(HighsModels.From(program), seconds);

    /// <summary>A quiet, single-threaded, time-limited HiGHS holding <paramref name="model"/> (the diagnoses' own solves).</summary>
    internal static HighsSolver Open(HighsModel model, double seconds)
    {
        var highs = new HighsSolver();
        highs.SetOption("output_flag", false);
        highs.SetOption("time_limit", seconds);
        highs.SetOption("threads", 1);
        highs.PassModel(model);
        return highs;
    }
}
