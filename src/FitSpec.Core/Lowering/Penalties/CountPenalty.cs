using System.Globalization;
using System.Numerics;
using FitSpec.Design;
using FitSpec.Expressions;
using FitSpec.Spec;

namespace FitSpec.Lowering.Penalties;

/// <summary>How a count fit is solved: one MILP, or one QP per support.</summary>
internal enum CountMode
{
    /// <summary>The program without the count rows is an LP: HiGHS's branch and cut on the whole MILP.</summary>
    Milp,

    /// <summary>The program has a Hessian and HiGHS has no mixed-integer QP: every support is tried.</summary>
    Enumerate,
}

/// <summary>
/// One coefficient a count penalty is on: its indicator binary z (column Binary), the rows β − U z ≤ 0
/// (UpperRow) and β − L z ≥ 0 (LowerRow), and the finite bounds L ≤ β ≤ U they were built from.
/// </summary>
internal sealed record CountedCoefficient(int Coefficient, string Name, int Binary, int UpperRow, int LowerRow, double Lower, double Upper)
{
    /// <summary>The bounds exclude 0, so the coefficient is non-zero in every feasible point.</summary>
    public bool AlwaysNonZero => Lower > 0 || Upper < 0;

    /// <summary>Both bounds are 0: the coefficient is zero whatever is chosen, and never counts.</summary>
    public bool AlwaysZero => Lower == 0 && Upper == 0;
}

/// <summary>
/// The strategy a count penalty sets: the program holds the full mixed-integer model (binaries, big-M rows
/// and the row Σ z ≤ Max at CardinalityRow); the support backend solves it and re-solves on the chosen support.
/// Supports counts the subsets the enumeration will try (0 for the MILP).
/// </summary>
internal sealed record CountStrategy(
    ProblemClass Class,
    CountMode Mode,
    int PenaltyIndex,
    int Max,
    IReadOnlyList<CountedCoefficient> Counted,
    int CardinalityRow,
    long Supports) : ISolveStrategy
{
    /// <summary>Above this many supports the enumeration is refused rather than left to run for long.</summary>
    public const long MaxSupports = 20_000;
}

/// <summary>
/// At most K of the listed coefficients non-zero. Each coefficient needs finite bounds L ≤ β ≤ U (from
/// bounds constraints or relations "name >= number" / "name <= number"); a binary z per coefficient with
/// β − U z ≤ 0 and β − L z ≥ 0 forces β = 0 when z = 0, and Σ z ≤ K counts them.
/// </summary>
internal sealed class CountPenalty : IPenaltyUnit
{
    public PenaltyKind Kind => PenaltyKind.Count;

    public void Lower(LoweringContext context, PenaltySpec penalty, int index, IReadOnlyList<int> on)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(penalty);
        ArgumentNullException.ThrowIfNull(on);
        var max = penalty.Max ?? 0;
        var coefficients = context.Design.Coefficients;
        switch (context.Strategy)
        {
            case CountStrategy:
                context.Error(penalty.Pos, "penalties.kind", "only one count penalty per fit; list every coefficient in one count's on:");
                return;
            case not null:
                context.Error(penalty.Pos, "penalties.kind", $"a count penalty cannot be combined with loss '{context.Spec.Loss.KindName}', which is solved by a method of its own; use l1, quantile, linf, deadzone, none or l2");
                return;
        }

        var bounds = FiniteBounds(context.Spec, coefficients);
        var missing = on.Where(j => !double.IsFinite(bounds[j].Lower) || !double.IsFinite(bounds[j].Upper)).ToList();
        if (missing.Count > 0)
        {
            var what = string.Join(", ", missing.Select(j => $"{coefficients[j].Name} ({Side(bounds[j])})"));
            var names = string.Join(", ", missing.Select(j => coefficients[j].Name));
            context.Error(penalty.Pos, "penalties.on", $"count needs finite bounds on both sides of every coefficient it is on (they make its big-M rows); missing for {what}; add {{kind: bounds, on: [{names}], min: ..., max: ...}}");
            return;
        }

        if (max >= on.Count)
        {
            context.Notes.Add(new LoweringNote($"penalty {index + 1}", $"count (max {max})", $"no restriction: at most {max} of {on.Count} coefficients; no binaries added"));
            return;
        }

        var b = context.Builder;
        var origin = new Origin(OriginKind.Penalty, index);
        var counted = new List<CountedCoefficient>();
        var cardinality = new List<Entry>();
        foreach (var j in on)
        {
            var (lo, hi) = bounds[j];
            var name = coefficients[j].Name;
            var probe = new CountedCoefficient(j, name, -1, -1, -1, lo, hi);
            // A coefficient whose bounds exclude 0 always counts; one fixed at 0 never does.
            var z = b.AddVar($"nz_{name}", probe.AlwaysNonZero ? 1 : 0, probe.AlwaysZero ? 0 : 1, 0, origin, integer: true);
            var m = context.RawRow(j);
            var upper = b.AddRow($"count_{name}_upper", double.NegativeInfinity, 0, [.. m, new Entry(z, -hi)], origin);
            var lower = b.AddRow($"count_{name}_lower", 0, double.PositiveInfinity, [.. m, new Entry(z, -lo)], origin);
            counted.Add(probe with { Binary = z, UpperRow = upper, LowerRow = lower });
            cardinality.Add(new Entry(z, 1));
        }

        var cardinalityRow = b.AddRow("count_max", double.NegativeInfinity, max, [.. cardinality], origin);
        var forced = counted.Count(c => c.AlwaysNonZero);
        var free = counted.Count(c => !c.AlwaysNonZero && !c.AlwaysZero);
        var label = $"count (max {max})";
        var item = $"penalty {index + 1}";
        if (forced > 0)
        {
            var names = string.Join(", ", counted.Where(c => c.AlwaysNonZero).Select(c => c.Name));
            context.Notes.Add(new LoweringNote(item, label, $"{names}: bounds exclude 0, so always non-zero and counted towards max {max}"));
        }

        if (!Quadratic(context))
        {
            context.Strategy = new CountStrategy(ProblemClass.MILP, CountMode.Milp, index, max, counted, cardinalityRow, 0);
            context.Notes.Add(new LoweringNote(item, label, $"MILP: {counted.Count} binaries, big-M from bounds; polished on the chosen support (an LP with the others fixed at 0)"));
            return;
        }

        var count = Supports(free, max - forced);
        if (count > CountStrategy.MaxSupports)
        {
            var shown = count.ToString("N0", CultureInfo.InvariantCulture);
            context.Error(penalty.Pos, "penalties.max",
                $"count with a quadratic objective (loss '{context.Spec.Loss.KindName}' or an l2/smoothness penalty) is solved exactly by trying every support, since HiGHS has no mixed-integer QP; at most {max} of {on.Count} coefficients gives {shown} supports, over the limit of {CountStrategy.MaxSupports:N0}; lower max, list fewer coefficients in on:, or use an l1 loss (solved as a MILP)");
            return;
        }

        var supports = (long)count;
        context.Strategy = new CountStrategy(ProblemClass.QP, CountMode.Enumerate, index, max, counted, cardinalityRow, supports);
        context.Notes.Add(new LoweringNote(item, label, $"QP, exact by enumeration of {supports} supports (every subset of at most {max} of {counted.Count}, one QP each; HiGHS has no mixed-integer QP); the {counted.Count} binaries with big-M from bounds stay in the program for export"));
    }

    /// <summary>Σ_{s=0}^{k} C(n, s): the subsets of at most k of n coefficients (exact, however large).</summary>
    internal static BigInteger Supports(int n, int k)
    {
        BigInteger total = 0;
        BigInteger term = 1;
        for (var s = 0; s <= Math.Min(k, n); s++)
        {
            total += term;
            // C(n, s+1) = C(n, s) (n - s) / (s + 1), exact in integers.
            term = term * (n - s) / (s + 1);
        }

        return total;
    }

    // The program will have a Hessian: from the loss already lowered, or from a quadratic penalty (which may
    // come after this one in the spec).
    private static bool Quadratic(LoweringContext context) =>
        context.Builder.HasHessian
        || context.Spec.Penalties.Any(p => p.Weight > 0 && (p.Kind == PenaltyKind.L2 || (p.Kind == PenaltyKind.Smoothness && !p.NormL1)));

    private static string Side((double Lower, double Upper) b) =>
        (double.IsFinite(b.Lower), double.IsFinite(b.Upper)) switch
        {
            (false, false) => "no bounds",
            (true, false) => "no upper bound",
            _ => "no lower bound",
        };

    /// <summary>
    /// The tightest bounds on each raw coefficient that the spec's constraints state directly: bounds items,
    /// and relations on a single coefficient (a·name op number, including ==).
    /// </summary>
    internal static (double Lower, double Upper)[] FiniteBounds(FitSpecDocument spec, IReadOnlyList<Coefficient> coefficients)
    {
        var result = Enumerable.Repeat((double.NegativeInfinity, double.PositiveInfinity), coefficients.Count).ToArray();
        void Tighten(int j, double lo, double hi) =>
            result[j] = (Math.Max(result[j].Item1, lo), Math.Min(result[j].Item2, hi));

        foreach (var c in spec.Constraints)
        {
            switch (c)
            {
                case BoundsConstraint bc:
                    for (var j = 0; j < coefficients.Count; j++)
                    {
                        if (bc.On is null || bc.On.Any(g => Glob.IsMatch(coefficients[j].Name, g.Value)))
                        {
                            Tighten(j, bc.Min ?? double.NegativeInfinity, bc.Max ?? double.PositiveInfinity);
                        }
                    }

                    break;
                case RelationConstraint rc when Linearizer.Linearize(rc.Text.Value).Relation is { Terms: [var (name, a)] } rel:
                    var k = -1;
                    for (var j = 0; j < coefficients.Count; j++)
                    {
                        if (coefficients[j].Name == name)
                        {
                            k = j;
                        }
                    }

                    if (k < 0 || a == 0)
                    {
                        break;
                    }

                    var v = rel.Constant / a;
                    var op = a > 0 ? rel.Operator : rel.Operator switch
                    {
                        RelationOperator.LessOrEqual => RelationOperator.GreaterOrEqual,
                        RelationOperator.GreaterOrEqual => RelationOperator.LessOrEqual,
                        _ => RelationOperator.Equal,
                    };
                    switch (op)
                    {
                        case RelationOperator.LessOrEqual:
                            Tighten(k, double.NegativeInfinity, v);
                            break;
                        case RelationOperator.GreaterOrEqual:
                            Tighten(k, v, double.PositiveInfinity);
                            break;
                        default:
                            Tighten(k, v, v);
                            break;
                    }

                    break;
            }
        }

        return result;
    }
}
