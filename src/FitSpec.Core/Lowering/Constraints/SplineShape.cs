using FitSpec.Design;

namespace FitSpec.Lowering.Constraints;

/// <summary>
/// Shape through a spline's coefficients. The k-th derivative of Σ s_i B_{i,d} is Σ s⁽ᵏ⁾_i B_{i,d-k}, with
/// s⁽⁰⁾ = s and s⁽ᵖ⁾_i = (d-p+1) (s⁽ᵖ⁻¹⁾_i - s⁽ᵖ⁻¹⁾_{i-1}) / (u_{i+d-p+1} - u_i); B-splines are non-negative,
/// so s⁽ᵏ⁾_i ≥ 0 for every i whose B_{i,d-k} is non-zero somewhere in the range makes the derivative ≥ 0 on
/// all of it (sufficient; necessary too when d ≤ k + 1 and the range ends at knots, since a piecewise constant
/// or linear derivative is non-negative exactly when its B-spline coefficients are). For k = 1 these are
/// the scaled first differences, for k = 2 the condition that (s_{i+1} - s_i) / (u_{i+d+1} - u_{i+1}) does not
/// decrease. When d = k - 1 the (k-1)-th derivative is piecewise constant and its jumps at the knots in the
/// range are what must not be negative.
/// </summary>
internal static class SplineShape
{
    /// <summary>The spline term that alone makes the curve depend on the input, when it is a spline in that column itself.</summary>
    public static TermLayout? Sole(Design.Design design, string input)
    {
        var dependent = design.Terms.Where(t => t.Inputs.Contains(input)).ToList();
        return dependent is [{ Spline: not null } term] && term.SplineColumn == input ? term : null;
    }

    /// <summary>
    /// Rows over the term's own coefficients (length = basis count), each to be ≥ 0 for a non-negative order-th
    /// derivative on [from, to]. Needs order ≤ degree + 1.
    /// </summary>
    public static List<double[]> Rows(BSplineBasis basis, int order, double from, double to)
    {
        var d = basis.Degree;
        var count = basis.Count;
        if (order > d + 1)
        {
            throw new ArgumentOutOfRangeException(nameof(order), $"order {order} exceeds degree {d} + 1");
        }

        // level[i] = s⁽ᵖ⁾_i as a row over s, for i = p .. count-1.
        var level = new double[count][];
        for (var i = 0; i < count; i++)
        {
            level[i] = new double[count];
            level[i][i] = 1;
        }

        var top = Math.Min(order, d);
        for (var p = 1; p <= top; p++)
        {
            var next = new double[count][];
            for (var i = p; i < count; i++)
            {
                var factor = (d - p + 1) / (basis.Knot(i + d - p + 1) - basis.Knot(i));
                var row = new double[count];
                for (var j = 0; j < count; j++)
                {
                    row[j] = factor * (level[i][j] - level[i - 1][j]);
                }

                next[i] = row;
            }

            level = next;
        }

        var rows = new List<double[]>();
        if (order <= d)
        {
            for (var i = order; i < count; i++)
            {
                if (basis.Knot(i) < to && basis.Knot(i + d - order + 1) > from)
                {
                    rows.Add(level[i]);
                }
            }

            return rows;
        }

        // Piecewise constant s⁽ᵈ⁾ on [u_i, u_{i+1}): its jump at u_i, for the knots inside the closed range.
        for (var i = d + 1; i < count; i++)
        {
            var knot = basis.Knot(i);
            if (knot >= from && knot <= to)
            {
                rows.Add(level[i].Select((v, j) => v - level[i - 1][j]).ToArray());
            }
        }

        return rows;
    }
}
