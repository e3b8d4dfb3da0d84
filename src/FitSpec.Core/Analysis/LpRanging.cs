using FitSpec.Lowering;
using FitSpec.Results;
using FitSpec.Solving;
using Highs.Native;

namespace FitSpec.Analysis;

/// <summary>
/// LP sensitivity for LP fits: the lowered program is solved once more by HiGHS's simplex (whatever form the
/// fit was solved in, ranging needs an optimal basis of this program), then HiGHS's ranging is read back onto
/// the user's constraints and plain coefficients.
/// </summary>
public static class LpRanging
{
    // Ranging re-solves the program from scratch by simplex: at 10⁴ l1 rows that was 5 s of a 6 s fit (measured).
    public const int MaxRows = 2_000;
    public const int MaxVariables = 50_000;
    private const int RowsShownPerConstraint = 5;

    public static RangingInfo? Compute(LoweredFit fit, double objective, CancellationToken cancellation = default)
    {
        ArgumentNullException.ThrowIfNull(fit);
        if (fit.Class != ProblemClass.LP || fit.Strategy is not null)
        {
            return null;
        }

        var program = fit.Program;
        if (program.NumRows > MaxRows || program.NumVars > MaxVariables)
        {
            return new RangingInfo([], [], $"ranging skipped: the LP has {program.NumRows} rows and {program.NumVars} variables (ranging re-solves it by simplex; limits {MaxRows} rows, {MaxVariables} variables)");
        }

        using var highs = new HighsSolver();
        highs.SetOption("output_flag", false);
        highs.SetOption("threads", 1);
        highs.SetOption("solver", "simplex");
        highs.PassModel(HighsModels.From(program));
        var run = highs.Run(new HighsRunMonitor(cancellation));
        cancellation.ThrowIfCancellationRequested();
        if (run.ModelStatus != HighsModelStatus.Optimal)
        {
            return new RangingInfo([], [], $"ranging unavailable: the simplex re-solve ended {run.ModelStatus}");
        }

        var resolved = run.ObjectiveValue;
        var scale = Math.Max(1, Math.Abs(objective));
        if (Math.Abs(resolved - objective) > 1e-6 * scale)
        {
            return new RangingInfo([], [], $"ranging unavailable: the simplex re-solve reached objective {resolved:R}, not the verified {objective:R}");
        }

        if (highs.GetRanging() is not { } r)
        {
            return new RangingInfo([], [], "ranging unavailable: HiGHS returned no ranging for this basis");
        }

        var bounds = new List<BoundRange>();
        foreach (var lc in fit.Constraints)
        {
            var label = lc.Spec.Label;
            var shown = 0;
            for (var k = 0; k < lc.Rows.Count && shown < RowsShownPerConstraint; k++)
            {
                var row = lc.Rows[k];
                if (!IsActive(run.RowValue[row], program.RowLower[row], program.RowUpper[row], out var value))
                {
                    continue;
                }

                var name = lc.Rows.Count > 1 ? $"{label} (row {k + 1} of {lc.Rows.Count})" : label;
                bounds.Add(new BoundRange(name, value, r.RowBoundDn[row], r.RowBoundUp[row], r.RowBoundDnObjective[row], r.RowBoundUpObjective[row]));
                shown++;
            }

            foreach (var (v, s) in lc.VarBounds)
            {
                if (!IsActive(run.ColValue[v], program.Lower[v], program.Upper[v], out var value))
                {
                    continue;
                }

                // θ = β / s for a bound carried on a variable: report in the user's units.
                var lo = r.ColBoundDn[v] * s;
                var hi = r.ColBoundUp[v] * s;
                bounds.Add(new BoundRange(label, value * s, Math.Min(lo, hi), Math.Max(lo, hi),
                    s >= 0 ? r.ColBoundDnObjective[v] : r.ColBoundUpObjective[v],
                    s >= 0 ? r.ColBoundUpObjective[v] : r.ColBoundDnObjective[v]));
            }
        }

        var costs = new List<CostRange>();
        var design = fit.Design;
        for (var j = 0; j < design.P; j++)
        {
            // Only where θ_j is β_j itself: a cost on a centred or scaled internal variable means nothing to a user.
            if (design.RawFromInternal[j] is [{ Index: var idx, Value: 1.0 }] && idx == j)
            {
                costs.Add(new CostRange(design.Coefficients[j].Name, r.ColCostDn[j], r.ColCostUp[j]));
            }
        }

        return new RangingInfo(bounds, costs, null);
    }

    private static bool IsActive(double activity, double lower, double upper, out double bound)
    {
        var tol = 1e-7 * Math.Max(1, Math.Abs(activity));
        if (double.IsFinite(lower) && Math.Abs(activity - lower) <= tol)
        {
            bound = lower;
            return true;
        }

        if (double.IsFinite(upper) && Math.Abs(activity - upper) <= tol)
        {
            bound = upper;
            return true;
        }

        bound = double.NaN;
        return false;
    }
}
