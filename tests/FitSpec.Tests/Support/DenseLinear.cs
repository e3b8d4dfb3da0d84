namespace FitSpec.Tests.Support;

/// <summary>Gaussian elimination with partial pivoting, the tests' own independent solver for small systems.</summary>
public static class DenseLinear
{
    /// <summary>Solves A x = b by Gaussian elimination with partial pivoting (A square, small, non-singular).</summary>
    public static double[] Solve(double[,] a, double[] b)
    {
        var n = b.Length;
        var m = (double[,])a.Clone();
        var x = (double[])b.Clone();
        for (var k = 0; k < n; k++)
        {
            var pivot = k;
            for (var i = k + 1; i < n; i++)
            {
                if (Math.Abs(m[i, k]) > Math.Abs(m[pivot, k]))
                {
                    pivot = i;
                }
            }

            for (var j = 0; j < n; j++)
            {
                (m[k, j], m[pivot, j]) = (m[pivot, j], m[k, j]);
            }

            (x[k], x[pivot]) = (x[pivot], x[k]);
            for (var i = k + 1; i < n; i++)
            {
                var f = m[i, k] / m[k, k];
                for (var j = k; j < n; j++)
                {
                    m[i, j] -= f * m[k, j];
                }

                x[i] -= f * x[k];
            }
        }

        for (var k = n - 1; k >= 0; k--)
        {
            var s = x[k];
            for (var j = k + 1; j < n; j++)
            {
                s -= m[k, j] * x[j];
            }

            x[k] = s / m[k, k];
        }

        return x;
    }
}
