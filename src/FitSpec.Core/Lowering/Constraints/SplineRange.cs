using FitSpec.Spec;

namespace FitSpec.Lowering.Constraints;

/// <summary>
/// A spline is fitted only between its end knots; a constraint at a point outside them would bind a
/// polynomial continuation the data never saw, so such points are refused with the knot range named.
/// </summary>
internal static class SplineRange
{
    /// <summary>False (with an error) when some spline's input at the point lies outside its knots.</summary>
    public static bool Inside(LoweringContext context, ConstraintSpec c, IReadOnlyDictionary<string, double> point, string field)
    {
        foreach (var t in context.Design.Terms)
        {
            if (t.Spline is not { } basis)
            {
                continue;
            }

            var x = t.SplineInputAt(point);
            if (!(x >= basis.Lower && x <= basis.Upper))
            {
                var where = string.Join(", ", t.Inputs.Select(i => $"{i} = {point[i]:G10}"));
                var input = t.SplineColumn is null ? $" (its input there is {x:G10})" : "";
                context.Error(c.Pos, field, $"the point {where} lies outside the knots [{basis.Lower:G10}, {basis.Upper:G10}] of spline term '{t.Key}'{input}; constrain the spline only within its knots, or widen them with 'at: [...]'");
                return false;
            }
        }

        return true;
    }
}
