using MathNet.Numerics.LinearAlgebra;

namespace FitSpec.Design;

/// <summary>Whether a constant column lies in the span of the basis (decides which r² formula applies).</summary>
internal static class SpanCheck
{
    public static bool ContainsConstant(double[][] columns)
    {
        if (columns.Length == 0 || columns[0].Length == 0)
        {
            return false;
        }

        var n = columns[0].Length;
        if (n <= columns.Length)
        {
            return true;
        }

        // Least squares of the ones vector on the basis; a relative residual near rounding means "in the span".
        var x = Matrix<double>.Build.Dense(n, columns.Length, (i, j) => columns[j][i]);
        for (var j = 0; j < columns.Length; j++)
        {
            var norm = x.Column(j).L2Norm();
            if (norm > 0)
            {
                x.SetColumn(j, x.Column(j) / norm);
            }
        }

        var ones = Vector<double>.Build.Dense(n, 1.0);
        var qr = x.QR(MathNet.Numerics.LinearAlgebra.Factorization.QRMethod.Thin);
        var fit = x * qr.Solve(ones);
        return (ones - fit).L2Norm() <= 1e-8 * Math.Sqrt(n);
    }
}
