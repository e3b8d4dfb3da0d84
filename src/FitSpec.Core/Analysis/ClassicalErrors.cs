using FitSpec.Results;
using FitSpec.Solving;

namespace FitSpec.Analysis;

/// <summary>
/// Standard errors of an unconstrained, unpenalised weighted least-squares fit: s·sqrt(diag (X'WX)⁻¹) with
/// s = residual_sd = sqrt(Σ w e² / (n − p)). Computed in double-double in the raw basis where that is cheap
/// (the same limit as the closed-form solve), else from the internal basis through β = Mθ.
/// </summary>
public static class ClassicalErrors
{
    public static IReadOnlyList<StandardError>? Compute(Design.Design design, double[] beta, double residualSd)
    {
        ArgumentNullException.ThrowIfNull(design);
        ArgumentNullException.ThrowIfNull(beta);
        var n = design.Rows;
        var p = design.P;
        if (n <= p || !double.IsFinite(residualSd))
        {
            return null;
        }

        var rowNorms = (long)n * p * p <= QrLeastSquares.ExtendedPrecisionLimit ? RawRowNorms(design) : InternalRowNorms(design);
        if (rowNorms is null)
        {
            return null;
        }

        return design.Coefficients.Select((c, j) =>
        {
            var se = residualSd * rowNorms[j];
            return new StandardError(c.Name, beta[j], se, se > 0 ? beta[j] / se : double.NaN);
        }).ToList();
    }

    private static double[] RawRowNorms(Design.Design design)
    {
        var (a, scale) = QrLeastSquares.RawScaledColumns(design, [], design.Rows);
        var norms = DoubleDoubleLeastSquares.InverseRowNorms(a);
        return norms.Select((v, j) => v * scale[j]).ToArray();
    }

    internal static double[]? InternalRowNorms(Design.Design design)
    {
        var p = design.P;
        if (InternalTriangle.Factor(design) is not { } r)
        {
            return null;
        }

        // R⁻¹ column by column, then row j of M R⁻¹ gives β_j's standard error over s.
        var inv = new double[p, p];
        for (var c = 0; c < p; c++)
        {
            for (var k = c; k >= 0; k--)
            {
                var s = k == c ? 1.0 : 0.0;
                for (var j = k + 1; j <= c; j++)
                {
                    s -= r[k, j] * inv[j, c];
                }

                inv[k, c] = s / r[k, k];
            }
        }

        var norms = new double[p];
        for (var j = 0; j < p; j++)
        {
            double sum = 0;
            for (var c = 0; c < p; c++)
            {
                double v = 0;
                foreach (var e in design.RawFromInternal[j])
                {
                    v += e.Value * inv[e.Index, c];
                }

                sum += v * v;
            }

            norms[j] = Math.Sqrt(sum);
        }

        return norms;
    }
}
