using FitSpec.Data;
using FitSpec.Diagnostics;
using FitSpec.Expressions;
using FitSpec.Spec;

namespace FitSpec.Design;

/// <summary>A spline term's knots from its spec and data, its design columns, and its basis jets at a point.</summary>
internal static class SplineColumns
{
    /// <summary>
    /// The basis for a term: knots from 'at:' (every value of the input must lie within them) or spread evenly
    /// over the input's range in the rows used. Null, with errors added, when there is none.
    /// </summary>
    public static BSplineBasis? Basis(SplineTerm st, double[] u, Table table, List<Diagnostic> errors)
    {
        var field = $"model.terms.{st.Key}";
        if (u.Any(v => !double.IsFinite(v)))
        {
            // Already reported, with its data line, by the caller's finiteness check.
            return null;
        }

        if (st.At is { } at)
        {
            var (lo, hi) = (at[0], at[^1]);
            var outside = Enumerable.Range(0, u.Length).Where(i => u[i] < lo || u[i] > hi).ToList();
            if (outside.Count > 0)
            {
                var i = outside[0];
                var more = outside.Count > 1 ? $" ({outside.Count} rows lie outside)" : "";
                errors.Add(new Diagnostic(table.DisplayPath, table.Lines[i], null, st.Input.Value,
                    $"value {u[i]:G10} lies outside the knots [{lo:G10}, {hi:G10}] of spline term '{st.Key}' ({field}.at){more}; widen the knots to cover the data"));
                return null;
            }

            return new BSplineBasis(at, st.Degree);
        }

        if (u.Length == 0)
        {
            errors.Add(new Diagnostic(st.Pos.File, st.Pos.Line, st.Pos.Column, field, $"spline term '{st.Key}' has no rows to place its knots over; give them with 'at: [...]'"));
            return null;
        }

        var (min, max) = (u.Min(), u.Max());
        if (!(max > min))
        {
            errors.Add(new Diagnostic(st.Pos.File, st.Pos.Line, st.Pos.Column, field,
                $"the input '{st.Input.Value}' of spline term '{st.Key}' takes the single value {min:G10} in the rows used; knots are spread over its range, so it needs a range (or give the knots with 'at: [...]')"));
            return null;
        }

        var t = BSplineBasis.UniformBreakpoints(min, max, st.Knots);
        for (var j = 1; j < t.Length; j++)
        {
            if (!(t[j] > t[j - 1]))
            {
                errors.Add(new Diagnostic(st.Pos.File, st.Pos.Line, st.Pos.Column, $"{field}.knots",
                    $"the range [{min:G17}, {max:G17}] of '{st.Input.Value}' is too narrow to hold {st.Knots} distinct knots in double precision; use fewer knots or rescale the input"));
                return null;
            }
        }

        return new BSplineBasis(t, st.Degree);
    }

    /// <summary>One column per basis function, each row filled only where its function can be non-zero.</summary>
    public static double[][] Columns(BSplineBasis basis, double[] u)
    {
        var columns = new double[basis.Count][];
        for (var j = 0; j < columns.Length; j++)
        {
            columns[j] = new double[u.Length];
        }

        Span<double> local = stackalloc double[basis.Degree + 1];
        for (var i = 0; i < u.Length; i++)
        {
            var first = basis.Evaluate(u[i], 0, local);
            for (var r = 0; r < local.Length; r++)
            {
                columns[first + r][i] = local[r];
            }
        }

        return columns;
    }

    /// <summary>B_j(g) for an input g given as a jet: value, and the chain rule for the first two derivatives.</summary>
    public static Jet[] Jets(BSplineBasis basis, Jet g)
    {
        var d = basis.Degree;
        Span<double> v = stackalloc double[d + 1];
        Span<double> d1 = stackalloc double[d + 1];
        Span<double> d2 = stackalloc double[d + 1];
        var first = basis.Evaluate(g.Value, 0, v);
        basis.Evaluate(g.Value, 1, d1);
        basis.Evaluate(g.Value, 2, d2);
        var jets = new Jet[basis.Count];
        for (var r = 0; r <= d; r++)
        {
            // A derivative-free input (the point's other inputs) leaves exact zeros, whatever B' is.
            var first1 = g.D1 == 0 ? 0 : d1[r] * g.D1;
            var second = (g.D1 == 0 ? 0 : d2[r] * g.D1 * g.D1) + (g.D2 == 0 ? 0 : d1[r] * g.D2);
            jets[first + r] = new Jet(v[r], first1, second);
        }

        return jets;
    }
}
