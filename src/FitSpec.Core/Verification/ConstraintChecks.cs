using FitSpec.Expressions;
using FitSpec.Lowering;
using FitSpec.Lowering.Constraints;
using FitSpec.Spec;

namespace FitSpec.Verification;

/// <summary>Violation and slack of one user constraint at β, from the constraint's own definition.</summary>
internal static class ConstraintChecks
{
    public static ConstraintCheck Evaluate(LoweredFit fit, LoweredConstraint lc, double[] beta, double[] e)
    {
        var design = fit.Design;
        var label = lc.Spec.Label;
        switch (lc.Spec)
        {
            case RelationConstraint r:
                {
                    var rel = lc.Relation!;
                    double lhs = 0, size = 0;
                    foreach (var (name, a) in rel.Terms)
                    {
                        var j = IndexOf(design, name);
                        lhs += a * beta[j];
                        size += Math.Abs(a * beta[j]);
                    }

                    var scale = Math.Max(1, Math.Max(Math.Abs(rel.Constant), size));
                    var (lo, hi) = rel.Operator switch
                    {
                        RelationOperator.LessOrEqual => (double.NegativeInfinity, rel.Constant),
                        RelationOperator.GreaterOrEqual => (rel.Constant, double.PositiveInfinity),
                        _ => (rel.Constant, rel.Constant),
                    };
                    var (violation, slack) = Interval(lhs, lo, hi, scale);
                    return Make(lc, "relation", violation, slack);
                }

            case BoundsConstraint b:
                {
                    double violation = 0, slack = double.PositiveInfinity;
                    var on = b.On is null
                        ? Enumerable.Range(0, design.P)
                        : Enumerable.Range(0, design.P).Where(j => b.On.Any(g => Design.Glob.IsMatch(design.Coefficients[j].Name, g.Value)));
                    foreach (var j in on)
                    {
                        var scale = Math.Max(1, Math.Abs(beta[j]));
                        var (v, s) = Interval(beta[j], b.Min ?? double.NegativeInfinity, b.Max ?? double.PositiveInfinity, scale);
                        violation = Math.Max(violation, v);
                        slack = Math.Min(slack, s);
                    }

                    return Make(lc, "bounds", violation, slack);
                }

            case ValueConstraint v:
                {
                    var point = v.At.ToDictionary(kv => kv.Key, kv => kv.Value, StringComparer.Ordinal);
                    var phi = design.Basis.At(point, null);
                    double f = 0, size = 0;
                    for (var j = 0; j < beta.Length; j++)
                    {
                        f += phi[j].Value * beta[j];
                        size += Math.Abs(phi[j].Value * beta[j]);
                    }

                    var (lo, hi) = v.EqualTo is { } eq ? (eq, eq) : (v.Min ?? double.NegativeInfinity, v.Max ?? double.PositiveInfinity);
                    var (violation, slack) = Interval(f, lo, hi, Math.Max(1, size));
                    return Make(lc, "value", violation, slack);
                }

            case ShapeConstraint s:
                {
                    var shape = lc.Shape!;
                    var (worst, size) = WorstDerivative(design, shape, beta, shape.GridPoints);
                    var finePoints = ((shape.GridPoints - 1) * 10) + 1;
                    var (fineWorst, _) = WorstDerivative(design, shape, beta, finePoints);
                    var scale = Math.Max(1, size);
                    var violation = Math.Max(0, -worst) / scale;
                    return Make(lc, s.Shape.ToString().ToLowerInvariant(), violation, worst / scale) with
                    {
                        FineGridWorst = Math.Max(0, -fineWorst),
                        FineGridPoints = finePoints,
                    };
                }

            case ResidualsConstraint rc:
                {
                    var maxAbs = e.Length == 0 ? 0 : e.Max(Math.Abs);
                    var scale = Math.Max(1, rc.MaxAbs);
                    return Make(lc, "residuals", Math.Max(0, maxAbs - rc.MaxAbs) / scale, (rc.MaxAbs - maxAbs) / scale);
                }

            default:
                return Make(lc, "unknown", 0, double.PositiveInfinity);
        }
    }

    // The signed first (monotone) or second (convex/concave) derivative, positive in the wanted direction, at
    // its worst grid point, and the derivative's size.
    private static (double Worst, double Size) WorstDerivative(Design.Design design, ShapeCheck shape, double[] beta, int points)
    {
        var point = new Dictionary<string, double>(shape.At, StringComparer.Ordinal);
        var sign = ShapeUnit.Sign(shape.Kind);
        var second = ShapeUnit.Order(shape.Kind) == 2;
        double worst = double.PositiveInfinity, size = 0;
        for (var k = 0; k < points; k++)
        {
            point[shape.Input] = ShapeUnit.GridPoint(shape.From, shape.To, points, k);
            var phi = design.Basis.At(point, shape.Input);
            double d = 0, s = 0;
            for (var j = 0; j < beta.Length; j++)
            {
                var dj = second ? phi[j].D2 : phi[j].D1;
                d += dj * beta[j];
                s += Math.Abs(dj * beta[j]);
            }

            worst = Math.Min(worst, sign * d);
            size = Math.Max(size, s);
        }

        return (worst, size);
    }

    private static (double Violation, double Slack) Interval(double value, double lo, double hi, double scale)
    {
        var violation = Math.Max(0, Math.Max(lo - value, value - hi)) / scale;
        var slack = Math.Min(value - lo, hi - value) / scale;
        return (violation, slack);
    }

    private static ConstraintCheck Make(LoweredConstraint lc, string kind, double violation, double slack) =>
        new(lc.Index, lc.Spec.Label, kind, slack <= Verifier.ActiveTolerance, null, violation, slack, lc.Grid, null, null);

    private static int IndexOf(Design.Design design, string name)
    {
        for (var j = 0; j < design.P; j++)
        {
            if (design.Coefficients[j].Name == name)
            {
                return j;
            }
        }

        throw new InvalidOperationException($"coefficient {name} vanished after lowering");
    }
}
