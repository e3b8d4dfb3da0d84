using FitSpec.Spec;

namespace FitSpec.Lowering.Losses;

/// <summary>
/// Σ w (y - Xθ)². As a QP in Gram form: ½θ'(2X'WX)θ - 2(X'Wy)'θ + y'Wy, a p×p Hessian whatever the row
/// count. Skipped when the closed form (QR) will solve the fit directly.
/// </summary>
internal sealed class L2Loss : ILossUnit
{
    public LossKind Kind => LossKind.L2;

    public void Lower(LoweringContext context, LossSpec loss)
    {
        var design = context.Design;
        if (!context.BuildGramHessian)
        {
            context.Notes.Add(new LoweringNote("loss", "l2", $"closed form: Householder QR on {design.Rows} × {design.P} (no program)"));
            return;
        }

        var b = context.Builder;
        var p = design.P;
        var n = design.Rows;
        var wy = new double[n];
        double yy = 0;
        for (var i = 0; i < n; i++)
        {
            var w = design.Weight(i);
            wy[i] = w * design.Y[i];
            yy += wy[i] * design.Y[i];
        }

        for (var a = 0; a < p; a++)
        {
            var xa = design.X[a];
            double c = 0;
            for (var i = 0; i < n; i++)
            {
                c += xa[i] * wy[i];
            }

            b.AddCost(a, -2 * c);
            for (var bb = 0; bb <= a; bb++)
            {
                var xb = design.X[bb];
                double g = 0;
                if (design.W is { } weights)
                {
                    for (var i = 0; i < n; i++)
                    {
                        g += xa[i] * weights[i] * xb[i];
                    }
                }
                else
                {
                    for (var i = 0; i < n; i++)
                    {
                        g += xa[i] * xb[i];
                    }
                }

                b.AddHessian(a, bb, 2 * g);
            }
        }

        b.AddOffset(yy);
        context.Notes.Add(new LoweringNote("loss", "l2", $"QP: Gram-form Hessian {p} × {p} from {n} rows"));
    }
}
