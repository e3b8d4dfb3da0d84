namespace FitSpec.Solving;

/// <summary>
/// An unevaluated sum hi + lo of two doubles (about 32 significant digits), with error-free transformations
/// (two-sum, FMA two-product). Used where double rounding would cost certified digits: small least-squares
/// problems in an ill-conditioned raw basis.
/// </summary>
internal readonly record struct DoubleDouble(double Hi, double Lo)
{
    public static readonly DoubleDouble Zero = new(0, 0);

    public static implicit operator DoubleDouble(double x) => new(x, 0);

    public double Value => Hi + Lo;

    public static DoubleDouble operator +(DoubleDouble a, DoubleDouble b)
    {
        var (s, e) = TwoSum(a.Hi, b.Hi);
        var (t, f) = TwoSum(a.Lo, b.Lo);
        e += t;
        (s, e) = QuickTwoSum(s, e);
        e += f;
        var (hi, lo) = QuickTwoSum(s, e);
        return new(hi, lo);
    }

    public static DoubleDouble operator -(DoubleDouble a) => new(-a.Hi, -a.Lo);

    public static DoubleDouble operator -(DoubleDouble a, DoubleDouble b) => a + (-b);

    public static DoubleDouble operator *(DoubleDouble a, DoubleDouble b)
    {
        var p = a.Hi * b.Hi;
        var e = Math.FusedMultiplyAdd(a.Hi, b.Hi, -p);
        e += (a.Hi * b.Lo) + (a.Lo * b.Hi);
        var (hi, lo) = QuickTwoSum(p, e);
        return new(hi, lo);
    }

    public static DoubleDouble operator /(DoubleDouble a, DoubleDouble b)
    {
        var q1 = a.Hi / b.Hi;
        var r = a - (b * q1);
        var q2 = r.Hi / b.Hi;
        r -= b * q2;
        var q3 = r.Hi / b.Hi;
        return new DoubleDouble(q1, 0) + q2 + q3;
    }

    public static DoubleDouble Sqrt(DoubleDouble a)
    {
        if (a.Hi <= 0)
        {
            return Zero;
        }

        var x = Math.Sqrt(a.Hi);
        var correction = (a - (new DoubleDouble(x, 0) * x)).Hi / (2 * x);
        return new DoubleDouble(x, 0) + correction;
    }

    public static DoubleDouble Abs(DoubleDouble a) => a.Hi < 0 || (a.Hi == 0 && a.Lo < 0) ? -a : a;

    public static DoubleDouble Add(DoubleDouble a, DoubleDouble b) => a + b;

    public static DoubleDouble Subtract(DoubleDouble a, DoubleDouble b) => a - b;

    public static DoubleDouble Multiply(DoubleDouble a, DoubleDouble b) => a * b;

    public static DoubleDouble Divide(DoubleDouble a, DoubleDouble b) => a / b;

    public static DoubleDouble Negate(DoubleDouble a) => -a;

    public static DoubleDouble FromDouble(double x) => x;

    private static (double S, double E) TwoSum(double a, double b)
    {
        var s = a + b;
        var bb = s - a;
        return (s, (a - (s - bb)) + (b - bb));
    }

    private static (double S, double E) QuickTwoSum(double a, double b)
    {
        var s = a + b;
        return (s, b - (s - a));
    }
}

/// <summary>Householder least squares in double-double arithmetic on column-stored data.</summary>
internal static class DoubleDoubleLeastSquares
{
    /// <summary>Solves min ‖A z - b‖ for full-rank A (columns), returning z. A's columns are overwritten.</summary>
    public static DoubleDouble[] Solve(DoubleDouble[][] a, DoubleDouble[] b)
    {
        var (r, y) = Reduce(a, b);
        var p = a.Length;
        var z = new DoubleDouble[p];
        for (var k = p - 1; k >= 0; k--)
        {
            var s = y[k];
            for (var j = k + 1; j < p; j++)
            {
                s -= r[k, j] * z[j];
            }

            z[k] = s / r[k, k];
        }

        return z;
    }

    /// <summary>
    /// The Euclidean norm of each row of R⁻¹ for A = QR (A's columns overwritten): the standard error of z_j is
    /// σ times row j's norm, since (A'A)⁻¹ = R⁻¹R⁻ᵀ.
    /// </summary>
    public static double[] InverseRowNorms(DoubleDouble[][] a)
    {
        var p = a.Length;
        var (r, _) = Reduce(a, new DoubleDouble[a.Length == 0 ? 0 : a[0].Length]);
        var inv = new DoubleDouble[p, p];
        for (var c = 0; c < p; c++)
        {
            // Column c of R⁻¹ solves R x = e_c; it is zero below row c.
            for (var k = c; k >= 0; k--)
            {
                var s = k == c ? new DoubleDouble(1, 0) : DoubleDouble.Zero;
                for (var j = k + 1; j <= c; j++)
                {
                    s -= r[k, j] * inv[j, c];
                }

                inv[k, c] = s / r[k, k];
            }
        }

        var norms = new double[p];
        for (var k = 0; k < p; k++)
        {
            var sum = DoubleDouble.Zero;
            for (var c = k; c < p; c++)
            {
                sum += inv[k, c] * inv[k, c];
            }

            norms[k] = DoubleDouble.Sqrt(sum).Value;
        }

        return norms;
    }

    private static (DoubleDouble[,] R, DoubleDouble[] Y) Reduce(DoubleDouble[][] a, DoubleDouble[] b)
    {
        var p = a.Length;
        var m = b.Length;
        var r = new DoubleDouble[p, p];
        var y = (DoubleDouble[])b.Clone();
        for (var k = 0; k < p; k++)
        {
            var v = a[k];
            var norm2 = DoubleDouble.Zero;
            for (var i = k; i < m; i++)
            {
                norm2 += v[i] * v[i];
            }

            var alpha = DoubleDouble.Sqrt(norm2);
            if (v[k].Hi > 0)
            {
                alpha = -alpha;
            }

            v[k] -= alpha;
            var vtv = DoubleDouble.Zero;
            for (var i = k; i < m; i++)
            {
                vtv += v[i] * v[i];
            }

            r[k, k] = alpha;
            if (vtv.Hi == 0)
            {
                continue;
            }

            var beta = new DoubleDouble(2, 0) / vtv;
            for (var j = k + 1; j < p; j++)
            {
                Reflect(v, a[j], beta, k, m);
                r[k, j] = a[j][k];
            }

            Reflect(v, y, beta, k, m);
        }

        return (r, y);
    }

    private static void Reflect(DoubleDouble[] v, DoubleDouble[] c, DoubleDouble beta, int k, int m)
    {
        var dot = DoubleDouble.Zero;
        for (var i = k; i < m; i++)
        {
            dot += v[i] * c[i];
        }

        dot *= beta;
        for (var i = k; i < m; i++)
        {
            c[i] -= dot * v[i];
        }
    }
}
