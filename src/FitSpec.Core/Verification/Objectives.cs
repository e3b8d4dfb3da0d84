using FitSpec.Spec;

namespace FitSpec.Verification;

/// <summary>The objective as SPEC.md defines it, from residuals and raw coefficients: Σ w φ(e) + penalties.</summary>
public static class Objectives
{
    public static double Loss(LossSpec loss, ReadOnlySpan<double> e, Func<int, double> weight)
    {
        ArgumentNullException.ThrowIfNull(loss);
        ArgumentNullException.ThrowIfNull(weight);
        var tau = loss.Parameter ?? 0.5;
        if (loss.Kind == LossKind.Linf)
        {
            double max = 0;
            for (var i = 0; i < e.Length; i++)
            {
                max = Math.Max(max, weight(i) * Math.Abs(e[i]));
            }

            return max;
        }

        double sum = 0;
        for (var i = 0; i < e.Length; i++)
        {
            sum += weight(i) * Phi(loss.Kind, loss.Parameter, e[i]);
        }

        return sum;
    }

    /// <summary>Each observation's penalty φ(e) (not used for linf, which is a whole-vector maximum).</summary>
    public static double Phi(LossKind kind, double? parameter, double e)
    {
        var a = Math.Abs(e);
        switch (kind)
        {
            case LossKind.L2:
                return e * e;
            case LossKind.L1:
                return a;
            case LossKind.Quantile:
                var tau = parameter!.Value;
                return e >= 0 ? tau * e : (tau - 1) * e;
            case LossKind.Huber:
                var m = parameter!.Value;
                return a <= m ? e * e : (2 * m * a) - (m * m);
            case LossKind.Deadzone:
                return Math.Max(0, a - parameter!.Value);
            case LossKind.LogBarrier:
                var lim = parameter!.Value;
                return a < lim ? -lim * lim * Math.Log(1 - (e / lim) * (e / lim)) : double.PositiveInfinity;
            case LossKind.Lp:
                return Math.Pow(a, parameter!.Value);
            case LossKind.TruncatedL2:
                var cap = parameter!.Value;
                return Math.Min(e * e, cap * cap);
            case LossKind.None:
                return 0;
            default:
                return a;
        }
    }

    public static double Penalty(PenaltySpec penalty, double[] beta, IReadOnlyList<int> on)
    {
        ArgumentNullException.ThrowIfNull(penalty);
        ArgumentNullException.ThrowIfNull(on);
        double s = 0;
        switch (penalty.Kind)
        {
            case PenaltyKind.L1:
                foreach (var j in on)
                {
                    s += Math.Abs(beta[j]);
                }

                return penalty.Weight * s;
            case PenaltyKind.L2:
                foreach (var j in on)
                {
                    s += beta[j] * beta[j];
                }

                return penalty.Weight * s;
            case PenaltyKind.Smoothness:
                {
                    var d = on.Select(j => beta[j]).ToArray();
                    for (var k = 0; k < penalty.Order!.Value && d.Length > 0; k++)
                    {
                        d = d.Skip(1).Select((v, i) => v - d[i]).ToArray();
                    }

                    return penalty.Weight * (penalty.NormL1 ? d.Sum(Math.Abs) : d.Sum(v => v * v));
                }

            default:
                return 0;
        }
    }

    public static double Total(FitSpecDocument spec, Design.Design design, double[] e, double[] beta, IReadOnlyList<IReadOnlyList<int>> penaltyTargets)
    {
        ArgumentNullException.ThrowIfNull(spec);
        ArgumentNullException.ThrowIfNull(design);
        ArgumentNullException.ThrowIfNull(penaltyTargets);
        var total = Loss(spec.Loss, e, design.Weight);
        for (var k = 0; k < spec.Penalties.Count; k++)
        {
            total += Penalty(spec.Penalties[k], beta, penaltyTargets[k]);
        }

        return total;
    }
}
