using FitSpec.Expressions;
using FitSpec.Lowering;
using FitSpec.Lowering.Constraints;
using FitSpec.Solving;
using FitSpec.Spec;

namespace FitSpec.Verification;

/// <summary>
/// Stage 6: re-checks a solution against the data and the user's own definitions — objective recomputed
/// from the raw coefficients, every constraint's violation, the primal–dual gap — independently of how the
/// fit was lowered.
/// </summary>
public static class Verifier
{
    /// <summary>Relative tolerance for the checks that decide pass/fail.</summary>
    public const double Tolerance = 1e-6;

    /// <summary>Relative slack under which a constraint counts as active.</summary>
    public const double ActiveTolerance = 1e-7;

    public static Checked Check(LoweredFit fit, Solution solution)
    {
        ArgumentNullException.ThrowIfNull(fit);
        ArgumentNullException.ThrowIfNull(solution);
        var design = fit.Design;
        var x = solution.X ?? throw new ArgumentException("solution has no point", nameof(solution));
        var theta = x[..design.P];
        var beta = solution.Raw ?? design.ToRaw(theta);
        var e = Residuals.FromRaw(design.Y, design.RawX, design.RawXLow, beta);
        var objective = Objectives.Total(fit.Spec, design, e, beta, fit.PenaltyTargets);
        var metrics = ComputeMetrics(design, e);
        var failures = new List<string>();

        double? solverObjective = null;
        double? objectiveDiff = null;
        double? dualObjective = null;
        double? gap = null;
        double? dualResidual = null;
        double? stationarity = null;
        double[]? closedFormFitted = null;
        if (fit.ClosedForm is { } ls)
        {
            closedFormFitted = design.Fitted(theta);
            stationarity = Stationarity(design, ls, theta, closedFormFitted);
            if (stationarity > Tolerance)
            {
                failures.Add($"normal-equation residual {stationarity:G3} exceeds {Tolerance:G1}");
            }
        }
        else
        {
            var program = solution.SolvedProgram ?? fit.Program;
            solverObjective = program.Objective(x);
            if (solution.RowDual is { } y && solution.ColDual is { } z && !program.HasIntegers)
            {
                (dualObjective, dualResidual) = Duality(program, x, y, z);
                // The gap is a difference of sums whose terms can dwarf the objective (the QP model of a steep
                // loss): relative to the objective, or to what rounding in those terms allows where that is more.
                var terms = Math.Abs(program.QuadraticForm(x)) + Enumerable.Range(0, program.NumVars).Sum(j => Math.Abs(program.Cost[j] * x[j]));
                gap = Math.Abs(solverObjective.Value - dualObjective.Value) / Math.Max(1, Math.Max(Math.Abs(solverObjective.Value), 1e-8 * terms));
                if (gap > Tolerance)
                {
                    failures.Add($"duality gap {gap:G3} exceeds {Tolerance:G1}");
                }

                if (dualResidual > Tolerance)
                {
                    failures.Add($"dual residual {dualResidual:G3} exceeds {Tolerance:G1}");
                }
            }
        }

        if (solution.KktResidual is { } kkt)
        {
            stationarity = kkt;
            if (kkt > Tolerance)
            {
                failures.Add($"KKT residual {kkt:G3} exceeds {Tolerance:G1}");
            }
        }

        var programObjective = solverObjective ?? ClosedFormObjective(fit, theta, closedFormFitted!);
        objectiveDiff = solution.ObjectiveComparable ? Math.Abs(programObjective - objective) / Math.Max(1, Math.Abs(objective)) : null;
        if (objectiveDiff > Tolerance)
        {
            failures.Add($"objective recomputed from the data ({objective:G10}) differs from the program's ({programObjective:G10}) by {objectiveDiff:G3} (relative)");
        }

        var checks = new List<ConstraintCheck>();
        foreach (var lc in fit.Constraints)
        {
            var c = ConstraintChecks.Evaluate(fit, lc, beta, e);
            var dual = solution.RowDual is null ? (double?)null : Dual(lc, solution);
            checks.Add(c with { Dual = dual is { } d && c.Active ? d : dual is null ? null : 0.0 });
            if (c.Violation > Tolerance)
            {
                failures.Add($"constraint '{lc.Spec.Label}' is violated by {c.Violation:G3} (relative)");
            }
        }

        // A count penalty is a hard limit: checked on the returned coefficients, where "non-zero" means exactly that.
        for (var k = 0; k < fit.Spec.Penalties.Count; k++)
        {
            if (fit.Spec.Penalties[k] is { Kind: PenaltyKind.Count, Max: { } max })
            {
                var nonZero = fit.PenaltyTargets[k].Count(j => beta[j] != 0);
                if (nonZero > max)
                {
                    failures.Add($"count penalty {k + 1}: {nonZero} coefficients are non-zero, more than max {max}");
                }
            }
        }

        var maxViolation = checks.Count == 0 ? 0 : checks.Max(c => c.Violation);
        var verification = new Verification(objective, solution.ObjectiveComparable ? solverObjective ?? programObjective : null, objectiveDiff, maxViolation, dualObjective, gap, dualResidual, stationarity, failures.Count == 0, failures)
        {
            StationarityKind = solution.KktResidual is null ? "Normal-equation residual" : "KKT residual",
        };
        return new Checked(beta, e, objective, metrics, checks, verification);
    }

    private static Metrics ComputeMetrics(Design.Design design, double[] e)
    {
        var n = e.Length;
        double sse = 0, sae = 0, maxAbs = 0, wsse = 0;
        for (var i = 0; i < n; i++)
        {
            sse += e[i] * e[i];
            sae += Math.Abs(e[i]);
            maxAbs = Math.Max(maxAbs, Math.Abs(e[i]));
            wsse += design.Weight(i) * e[i] * e[i];
        }

        var y = design.Y;
        double total;
        if (design.ConstantInSpan)
        {
            var mean = y.Average();
            total = y.Sum(v => (v - mean) * (v - mean));
        }
        else
        {
            total = y.Sum(v => v * v);
        }

        var r2 = total > 0 ? 1 - sse / total : double.NaN;
        double? sd = n > design.P ? Math.Sqrt(wsse / (n - design.P)) : null;
        return new Metrics(n, Math.Sqrt(sse / n), sae / n, maxAbs, r2, sd);
    }

    // The gradient of the least-squares objective, column by column, relative to ‖column‖·‖√W y‖: zero at the
    // exact optimum, independent of the data's scale, and still meaningful when the fit is exact (residual
    // at rounding level), where a cosine against the residual would not be.
    private static double Stationarity(Design.Design design, LeastSquaresForm ls, double[] theta, double[] fitted)
    {
        var n = design.Rows;
        var r = new double[n];
        for (var i = 0; i < n; i++)
        {
            r[i] = design.Weight(i) * (design.Y[i] - fitted[i]);
        }

        var ridgeValues = ls.RidgeRows.Select(row => row.Sum(en => en.Value * theta[en.Index])).ToArray();
        double yy = 0;
        for (var i = 0; i < n; i++)
        {
            yy += design.Weight(i) * design.Y[i] * design.Y[i];
        }

        if (yy == 0)
        {
            return 0;
        }

        double worst = 0;
        for (var j = 0; j < design.P; j++)
        {
            double g = 0, colNorm = 0;
            var col = design.X[j];
            for (var i = 0; i < n; i++)
            {
                g += col[i] * r[i];
                colNorm += design.Weight(i) * col[i] * col[i];
            }

            for (var k = 0; k < ls.RidgeRows.Count; k++)
            {
                foreach (var en in ls.RidgeRows[k])
                {
                    if (en.Index == j)
                    {
                        g -= en.Value * ridgeValues[k];
                        colNorm += en.Value * en.Value;
                    }
                }
            }

            if (colNorm > 0)
            {
                worst = Math.Max(worst, Math.Abs(g) / Math.Sqrt(colNorm * yy));
            }
        }

        return worst;
    }

    private static double ClosedFormObjective(LoweredFit fit, double[] theta, double[] fitted)
    {
        var design = fit.Design;
        double s = 0;
        for (var i = 0; i < design.Rows; i++)
        {
            var r = design.Y[i] - fitted[i];
            s += design.Weight(i) * r * r;
        }

        foreach (var row in fit.ClosedForm!.RidgeRows)
        {
            var v = row.Sum(en => en.Value * theta[en.Index]);
            s += v * v;
        }

        return s;
    }

    // Dual objective of the program at (y, z), and the stationarity residual ‖c + Qx - A'y - z‖∞.
    private static (double Dual, double Residual) Duality(FitProgram p, double[] x, double[] y, double[] z)
    {
        var dual = p.Offset - 0.5 * p.QuadraticForm(x);
        double infeasible = 0;
        for (var r = 0; r < p.NumRows; r++)
        {
            dual += BoundTerm(y[r], p.RowLower[r], p.RowUpper[r], ref infeasible);
        }

        var qx = p.HessianTimes(x);
        double residual = 0, scale = 1;
        for (var j = 0; j < p.NumVars; j++)
        {
            dual += BoundTerm(z[j], p.Lower[j], p.Upper[j], ref infeasible);
            var g = p.Cost[j] + qx[j] - z[j];
            for (var k = p.ColStart[j]; k < p.ColStart[j + 1]; k++)
            {
                g -= p.Values[k] * y[p.RowIndex[k]];
            }

            residual = Math.Max(residual, Math.Abs(g));
            scale = Math.Max(scale, Math.Abs(p.Cost[j]) + Math.Abs(qx[j]));
        }

        return (dual, Math.Max(residual, infeasible) / scale);
    }

    private static double BoundTerm(double multiplier, double lower, double upper, ref double infeasible)
    {
        if (multiplier > 0)
        {
            if (double.IsFinite(lower))
            {
                return multiplier * lower;
            }

            infeasible = Math.Max(infeasible, multiplier);
        }
        else if (multiplier < 0)
        {
            if (double.IsFinite(upper))
            {
                return multiplier * upper;
            }

            infeasible = Math.Max(infeasible, -multiplier);
        }

        return 0;
    }

    // SPEC's convention: an inequality's dual is the objective's fall per unit relaxation (≥ 0); an
    // equality's is d(objective)/d(constant side). A constraint over several rows reports the sum.
    private static double Dual(LoweredConstraint lc, Solution s)
    {
        var equality = lc.IsEquality;
        double total = 0;
        foreach (var row in lc.Rows)
        {
            total += equality ? s.RowDual![row] : Math.Abs(s.RowDual![row]);
        }

        foreach (var (v, scale) in lc.VarBounds)
        {
            var d = s.ColDual![v] / scale;
            total += equality ? d : Math.Abs(d);
        }

        return total;
    }
}
