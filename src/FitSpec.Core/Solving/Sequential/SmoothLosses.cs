namespace FitSpec.Solving.Sequential;

/// <summary>A smooth convex loss φ(e) per observation, with what Newton's method needs of it.</summary>
internal interface ISmoothLoss
{
    /// <summary>φ(e); +∞ outside the loss's domain.</summary>
    double Value(double e);

    /// <summary>φ'(e).</summary>
    double Slope(double e);

    /// <summary>
    /// The curvature used in the quadratic model: φ''(e), safeguarded where it blows up or vanishes
    /// (<paramref name="scale"/> is a typical residual size, for losses whose safeguard needs one).
    /// </summary>
    double Curvature(double e, double scale);
}

/// <summary>φ(e) = −a² log(1 − (e/a)²) for |e| &lt; a: e² near 0, +∞ at the limit.</summary>
internal sealed class LogBarrierPhi(double limit) : ISmoothLoss
{
    public double Value(double e)
    {
        var m = Math.Abs(e);
        if (!(m < limit))
        {
            return double.PositiveInfinity;
        }

        // Far from the limit log(1 − u²) is a log of nearly 1: take it as log1p(−u²), which keeps u²'s digits.
        var u = m / limit;
        return -limit * limit * (u * u < 0.5 ? Log1P(-u * u) : Math.Log(Inside(m)));
    }

    public double Slope(double e) => 2 * e / Inside(Math.Abs(e));

    public double Curvature(double e, double scale)
    {
        var u = e / limit;
        var s = Inside(Math.Abs(e));
        return 2 * (1 + u * u) / (s * s);
    }

    // 1 − (e/a)² as (a − |e|)(a + |e|)/a²: a − |e| is exact when |e| is near a (Sterbenz), where the barrier
    // lives and where 1 − u² would keep few correct digits. Near 0 the product loses nothing either.
    private double Inside(double m) => (limit - m) * (limit + m) / (limit * limit);

    // log(1 + x) for small x by Goldberg's correction: log(w)·x/(w − 1) with w = 1 + x rounded.
    private static double Log1P(double x)
    {
        var w = 1 + x;
        return w == 1 ? x : Math.Log(w) * x / (w - 1);
    }
}

/// <summary>
/// φ(e) = |e|^p, p &gt; 1. Its curvature p(p−1)|e|^(p−2) is infinite at 0 for p &lt; 2 and zero there for
/// p &gt; 2; the model evaluates it with |e| floored at 1e-6 of the typical residual, so the QP stays well
/// posed. The floor changes only the model: the line search and the stopping test use the true φ and φ'.
/// </summary>
internal sealed class PowerPhi(double p) : ISmoothLoss
{
    public const double Floor = 1e-6;

    public double Value(double e) => Math.Pow(Math.Abs(e), p);

    public double Slope(double e) => p * Math.Pow(Math.Abs(e), p - 1) * Math.Sign(e);

    public double Curvature(double e, double scale) =>
        p == 2 ? 2 : p * (p - 1) * Math.Pow(Math.Max(Math.Abs(e), Floor * scale), p - 2);
}
