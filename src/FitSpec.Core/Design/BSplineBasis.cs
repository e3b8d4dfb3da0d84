namespace FitSpec.Design;

/// <summary>
/// Clamped B-splines of one degree d over strictly increasing breakpoints t_0 &lt; … &lt; t_{K-1}. The knot
/// vector u repeats each end d+1 times and holds the inner breakpoints once, giving K+d-1 functions B_i that
/// are non-negative, supported on [u_i, u_{i+d+1}], and sum to one on [t_0, t_{K-1}]. Values come from the
/// Cox–de Boor recursion; derivatives from the difference formula D Σ c_i B_{i,p} = Σ p (c_i - c_{i-1}) /
/// (u_{i+p} - u_i) B_{i,p-1}. Outside the breakpoints the end pieces are continued as polynomials.
/// </summary>
public sealed class BSplineBasis
{
    /// <summary>Highest degree accepted (the spec's limit).</summary>
    public const int MaxDegree = 10;

    private readonly double[] _breaks;
    private readonly double[] _u;

    public BSplineBasis(IReadOnlyList<double> breakpoints, int degree)
    {
        ArgumentNullException.ThrowIfNull(breakpoints);
        ArgumentOutOfRangeException.ThrowIfNegative(degree);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(degree, MaxDegree);
        if (breakpoints.Count < 2)
        {
            throw new ArgumentException("a spline needs at least two breakpoints", nameof(breakpoints));
        }

        _breaks = [.. breakpoints];
        for (var j = 0; j < _breaks.Length; j++)
        {
            if (!double.IsFinite(_breaks[j]) || (j > 0 && !(_breaks[j] > _breaks[j - 1])))
            {
                throw new ArgumentException("breakpoints must be finite and strictly increasing", nameof(breakpoints));
            }
        }

        Degree = degree;
        var k = _breaks.Length;
        _u = new double[k + (2 * degree)];
        for (var i = 0; i < _u.Length; i++)
        {
            _u[i] = _breaks[Math.Clamp(i - degree, 0, k - 1)];
        }
    }

    /// <summary>K breakpoints spaced evenly over [lower, upper], both ends exact.</summary>
    public static double[] UniformBreakpoints(double lower, double upper, int knots)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(knots, 2);
        var t = new double[knots];
        for (var j = 0; j < knots; j++)
        {
            t[j] = j == knots - 1 ? upper : lower + ((upper - lower) * j / (knots - 1));
        }

        return t;
    }

    public int Degree { get; }

    /// <summary>Number of basis functions (and coefficients): K + d - 1.</summary>
    public int Count => _breaks.Length + Degree - 1;

    public IReadOnlyList<double> Breakpoints => _breaks;

    public double Lower => _breaks[0];

    public double Upper => _breaks[^1];

    /// <summary>Entry i of the full (clamped) knot vector, 0 ≤ i &lt; Count + Degree + 1.</summary>
    public double Knot(int i) => _u[i];

    /// <summary>B_i is zero outside [From, To].</summary>
    public (double From, double To) Support(int i) => (_u[i], _u[i + Degree + 1]);

    /// <summary>
    /// The order-th derivative of the d+1 functions that can be non-zero at x, B_first … B_{first+d}, into
    /// <paramref name="result"/> (length ≥ d+1); returns first. Orders above the degree give zeros.
    /// </summary>
    public int Evaluate(double x, int order, Span<double> result)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(order);
        var d = Degree;
        if (result.Length < d + 1)
        {
            throw new ArgumentException($"result needs {d + 1} entries", nameof(result));
        }

        var mu = SpanOf(x);
        var first = mu - d;
        if (order > d)
        {
            result[..(d + 1)].Clear();
            return first;
        }

        // n[p][r] = B_{mu-p+r, p}(x), r = 0..p: the triangle of every lower degree, which derivatives need.
        Span<double> n = stackalloc double[(d + 1) * (d + 1)];
        n[0] = 1;
        for (var p = 1; p <= d; p++)
        {
            var prev = n.Slice((p - 1) * (d + 1), p);
            var cur = n.Slice(p * (d + 1), p + 1);
            for (var r = 0; r <= p; r++)
            {
                var i = mu - p + r;
                double v = 0;
                if (r >= 1)
                {
                    v += (x - _u[i]) / (_u[i + p] - _u[i]) * prev[r - 1];
                }

                if (r <= p - 1)
                {
                    v += (_u[i + p + 1] - x) / (_u[i + p + 1] - _u[i + 1]) * prev[r];
                }

                cur[r] = v;
            }
        }

        var top = n.Slice((d - order) * (d + 1), d - order + 1);
        if (order == 0)
        {
            top.CopyTo(result);
            return first;
        }

        // Each function as a coefficient vector over the local degree-p functions, differenced down to degree d-order.
        Span<double> a = stackalloc double[d + 1];
        for (var r = 0; r <= d; r++)
        {
            a.Clear();
            a[r] = 1;
            for (var p = d; p > d - order; p--)
            {
                for (var q = 0; q < p; q++)
                {
                    a[q] = p * (a[q + 1] - a[q]) / (_u[mu + q + 1] - _u[mu + q + 1 - p]);
                }
            }

            double s = 0;
            for (var q = 0; q <= d - order; q++)
            {
                s += a[q] * top[q];
            }

            result[r] = s;
        }

        return first;
    }

    /// <summary>All Count functions' order-th derivative at x (zeros where a function vanishes).</summary>
    public double[] All(double x, int order = 0)
    {
        var all = new double[Count];
        Span<double> local = stackalloc double[Degree + 1];
        var first = Evaluate(x, order, local);
        for (var r = 0; r <= Degree; r++)
        {
            all[first + r] = local[r];
        }

        return all;
    }

    // The knot index mu with u_mu ≤ x < u_{mu+1} and u_mu < u_{mu+1}; the last piece is closed on the right,
    // and points outside use the nearest end piece.
    private int SpanOf(double x)
    {
        var lo = 0;
        var hi = _breaks.Length - 2;
        if (x >= _breaks[hi])
        {
            return hi + Degree;
        }

        while (lo < hi)
        {
            var mid = (lo + hi + 1) / 2;
            if (_breaks[mid] <= x)
            {
                lo = mid;
            }
            else
            {
                hi = mid - 1;
            }
        }

        return lo + Degree;
    }
}
