using System.Globalization;
using FitSpec.Lowering;
using FitSpec.Results;
using FitSpec.Verification;

namespace FitSpec.Analysis;

/// <summary>Reads each active constraint's dual as a plain sentence about a small change of its constant side.</summary>
public static class DualSentences
{
    /// <summary>
    /// The change a sentence speaks of: a round 1% of the constraint's constant side (at least 0.01), so that the
    /// first-order reading holds; for an LP also inside the range where the dual stays exact.
    /// </summary>
    public static double StepFor(double constant, BoundRange? range)
    {
        var scale = Math.Max(1, Math.Abs(constant));
        var step = Math.Pow(10, Math.Round(Math.Log10(scale)) - 2);
        if (range is not null)
        {
            var room = Math.Max(range.High - range.Value, range.Value - range.Low);
            while (step > room / 2 && step > 1e-12)
            {
                step /= 10;
            }
        }

        return step;
    }

    public static IReadOnlyList<DualReading> Read(LoweredFit fit, IReadOnlyList<ConstraintCheck> checks, RangingInfo? ranging)
    {
        ArgumentNullException.ThrowIfNull(fit);
        ArgumentNullException.ThrowIfNull(checks);
        var readings = new List<DualReading>();
        foreach (var c in checks.Where(c => c.Active))
        {
            var lowered = fit.Constraints.FirstOrDefault(l => l.Index == c.Index);
            var range = ranging?.Constraints.FirstOrDefault(r => r.Label == c.Label);
            var step = StepFor(lowered is null ? 0 : Constant(fit, lowered), range);
            var exact = range is null ? "" : $"; exact while its constant stays within [{Num(range.Low)}, {Num(range.High)}]";
            var rows = lowered is null ? 1 : lowered.Rows.Count + lowered.VarBounds.Count;
            var each = rows > 1 ? $" (at each of its {rows} rows)" : "";
            var label = $"`{c.Label}`";
            string sentence;
            if (c.Dual is not { } dual)
            {
                sentence = $"{label} holds with equality; this fit is not convex, so it has no prices to read.";
                readings.Add(new DualReading(c.Label, double.NaN, sentence));
                continue;
            }

            var change = dual * step;
            if (lowered?.IsEquality == true)
            {
                sentence = dual == 0
                    ? $"Moving the constant side of {label} a little would not change the objective at the margin (rate 0)."
                    : $"Raising the constant side of {label} by {Num(step)}{each} would {(change > 0 ? "raise" : "lower")} the objective by about {Num(Math.Abs(change))}; lowering it, the reverse (rate {Num(dual)} per unit{exact}).";
            }
            else
            {
                sentence = dual == 0
                    ? $"{label} is active but costs nothing at the margin: relaxing it a little would not lower the objective (price 0)."
                    : $"Relaxing {label} by {Num(step)}{each} would lower the objective by about {Num(change)} (price {Num(dual)} per unit{exact}).";
            }

            readings.Add(new DualReading(c.Label, dual, sentence));
        }

        return readings;
    }

    /// <summary>The largest finite constant among the constraint's rows and bounds, in the user's units.</summary>
    private static double Constant(LoweredFit fit, LoweredConstraint lc)
    {
        var p = fit.Program;
        double c = 0;
        foreach (var r in lc.Rows)
        {
            foreach (var b in (double[])[p.RowLower[r], p.RowUpper[r]])
            {
                c = double.IsFinite(b) ? Math.Max(c, Math.Abs(b)) : c;
            }
        }

        foreach (var (v, s) in lc.VarBounds)
        {
            foreach (var b in (double[])[p.Lower[v], p.Upper[v]])
            {
                c = double.IsFinite(b) ? Math.Max(c, Math.Abs(b * s)) : c;
            }
        }

        return c;
    }

    private static string Num(double x) => x.ToString("G3", CultureInfo.InvariantCulture);
}
