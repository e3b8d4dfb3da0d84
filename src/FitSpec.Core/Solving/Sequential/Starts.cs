using FitSpec.Design;
using FitSpec.Lowering;

namespace FitSpec.Solving.Sequential;

/// <summary>
/// Fits of the same model under the same constraints with a convex loss of one program, used to start (or
/// to prove infeasible) a sequential method. Each is the lowered program with that loss added.
/// </summary>
internal static class Starts
{
    /// <summary>Σ w e² plus the program's penalties: a QP in Gram form.</summary>
    public static FitProgram LeastSquares(FitProgram program, Design.Design design, Func<int, bool>? counts = null, double outsideCost = 0)
    {
        var n = design.Rows;
        var a = new double[n];
        var b = new double[n];
        var c = new double[n];
        for (var i = 0; i < n; i++)
        {
            var w = design.Weight(i);
            if (counts is null || counts(i))
            {
                // w (y − f)² = w f² − 2wy f + w y².
                a[i] = w;
                b[i] = -2 * w * design.Y[i];
                c[i] = w * design.Y[i] * design.Y[i];
            }
            else
            {
                c[i] = w * outsideCost;
            }
        }

        return Subproblems.WithQuadratic(program, design, a, b, c);
    }

    /// <summary>Σ w |e| plus the program's penalties: split variables u − v = e, one row per observation.</summary>
    public static FitProgram LeastAbsolute(FitProgram program, Design.Design design) => Subproblems.Extend(program, b =>
    {
        var p = design.P;
        var origin = new Origin(OriginKind.Loss, 0);
        var entries = new Entry[p + 2];
        for (var i = 0; i < design.Rows; i++)
        {
            var w = design.Weight(i);
            var u = b.AddVar($"u{i + 1}", 0, double.PositiveInfinity, w, origin);
            var v = b.AddVar($"v{i + 1}", 0, double.PositiveInfinity, w, origin);
            for (var j = 0; j < p; j++)
            {
                entries[j] = new Entry(j, design.X[j][i]);
            }

            entries[p] = new Entry(u, 1);
            entries[p + 1] = new Entry(v, -1);
            b.AddRow($"r{i + 1}", design.Y[i], design.Y[i], entries, origin);
        }
    });

    /// <summary>
    /// max_i s_i |e_i| (s_i = w_i, or 1 when <paramref name="weighted"/> is false) plus the program's objective,
    /// as a bound variable t (the last variable) and two rows per observation.
    /// </summary>
    public static FitProgram Minimax(FitProgram program, Design.Design design, bool weighted) => Subproblems.Extend(program, b =>
    {
        var p = design.P;
        var origin = new Origin(OriginKind.Loss, 0);
        var t = b.AddVar("t", 0, double.PositiveInfinity, 1, origin);
        var entries = new Entry[p + 1];
        for (var i = 0; i < design.Rows; i++)
        {
            var s = weighted ? design.Weight(i) : 1;
            for (var j = 0; j < p; j++)
            {
                entries[j] = new Entry(j, s * design.X[j][i]);
            }

            entries[p] = new Entry(t, 1);
            b.AddRow($"lo{i + 1}", s * design.Y[i], double.PositiveInfinity, entries, origin);
            entries[p] = new Entry(t, -1);
            b.AddRow($"hi{i + 1}", double.NegativeInfinity, s * design.Y[i], entries, origin);
        }
    });

    /// <summary>The first <paramref name="count"/> entries of a subproblem's point (the lowered program's variables).</summary>
    public static double[] Head(double[] x, int count) => x[..count];
}
