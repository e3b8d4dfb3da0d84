namespace FitSpec.Expressions;

/// <summary>
/// A value with its first and second derivative in one variable (second-order forward mode). Values follow the
/// same arithmetic as <see cref="ExpressionEvaluator.EvaluateScalar"/>. Kinks (abs at 0, ties in min/max) are
/// treated one-sidedly: the derivative is that of the branch the value comes from.
/// </summary>
public readonly record struct Jet(double Value, double D1, double D2)
{
    public static Jet Constant(double v) => new(v, 0, 0);

    public static Jet Variable(double v) => new(v, 1, 0);

    internal bool IsConstant => D1 == 0 && D2 == 0;

    public static Jet operator +(Jet a, Jet b) => new(a.Value + b.Value, a.D1 + b.D1, a.D2 + b.D2);

    public static Jet operator -(Jet a, Jet b) => new(a.Value - b.Value, a.D1 - b.D1, a.D2 - b.D2);

    public static Jet operator -(Jet a) => new(-a.Value, -a.D1, -a.D2);

    public static Jet operator +(Jet a) => a;

    public static Jet operator *(Jet a, Jet b) => new(
        a.Value * b.Value,
        Times(a.D1, b.Value) + Times(a.Value, b.D1),
        Times(a.D2, b.Value) + (2 * Times(a.D1, b.D1)) + Times(a.Value, b.D2));

    public static Jet operator /(Jet a, Jet b)
    {
        var q = a.Value / b.Value;
        if (b.IsConstant)
        {
            return new(q, Over(a.D1, b.Value), Over(a.D2, b.Value));
        }

        // From a = q*b: a' = q'b + qb', a'' = q''b + 2q'b' + qb''.
        var d1 = (a.D1 - Times(q, b.D1)) / b.Value;
        var d2 = (a.D2 - (2 * Times(d1, b.D1)) - Times(q, b.D2)) / b.Value;
        return new(q, d1, d2);
    }

    public static Jet Add(Jet a, Jet b) => a + b;

    public static Jet Subtract(Jet a, Jet b) => a - b;

    public static Jet Multiply(Jet a, Jet b) => a * b;

    public static Jet Divide(Jet a, Jet b) => a / b;

    public static Jet Negate(Jet a) => -a;

    public static Jet Plus(Jet a) => a;

    public static Jet Log(Jet x) => Chain(x, Math.Log(x.Value), 1 / x.Value, -1 / (x.Value * x.Value));

    public static Jet Exp(Jet x)
    {
        var e = Math.Exp(x.Value);
        return Chain(x, e, e, e);
    }

    public static Jet Sqrt(Jet x)
    {
        var s = Math.Sqrt(x.Value);
        var d1 = 0.5 / s;
        return Chain(x, s, d1, -d1 / (2 * x.Value));
    }

    /// <summary>At 0 the right-hand branch (+x) is used.</summary>
    public static Jet Abs(Jet x) => x.Value >= 0 ? new(Math.Abs(x.Value), x.D1, x.D2) : -x;

    /// <summary>
    /// Ties take the first argument's derivatives; the value is always <see cref="Math.Min(double, double)"/>'s,
    /// so NaN propagates and a tie of 0 and -0 gives -0 (which decides the sign of a later division by it).
    /// </summary>
    public static Jet Min(Jet a, Jet b) =>
        double.IsNaN(a.Value) ? a : double.IsNaN(b.Value) ? b : a.Value < b.Value ? a : b.Value < a.Value ? b : a with { Value = Math.Min(a.Value, b.Value) };

    /// <summary>
    /// Ties take the first argument's derivatives; the value is always <see cref="Math.Max(double, double)"/>'s,
    /// so NaN propagates and a tie of 0 and -0 gives 0.
    /// </summary>
    public static Jet Max(Jet a, Jet b) =>
        double.IsNaN(a.Value) ? a : double.IsNaN(b.Value) ? b : a.Value > b.Value ? a : b.Value > a.Value ? b : a with { Value = Math.Max(a.Value, b.Value) };

    /// <summary>x^n for a constant n: the power rule, with exact zeros where n or n-1 is zero.</summary>
    public static Jet Pow(Jet x, double n)
    {
        var value = Ops.Pow(x.Value, n);
        if (x.IsConstant)
        {
            return Constant(value);
        }

        // A zero coefficient must give a zero term even when x^(n-1) or x^(n-2) is infinite (x = 0).
        var d1 = n == 0 ? 0 : n * Ops.Pow(x.Value, n - 1);
        var c2 = n * (n - 1);
        var d2 = c2 == 0 ? 0 : c2 * Ops.Pow(x.Value, n - 2);
        return Chain(x, value, d1, d2);
    }

    /// <summary>x^y; a constant exponent uses the power rule, otherwise exp(y log x).</summary>
    public static Jet Pow(Jet x, Jet y)
    {
        if (y.IsConstant)
        {
            return Pow(x, y.Value);
        }

        var value = Ops.Pow(x.Value, y.Value);
        if (x.IsConstant)
        {
            // a^y: derivatives are a^y * ln(a)^k times the chain terms of y.
            var ln = Math.Log(x.Value);
            var d1 = Times(value, ln);
            return Chain(y, value, d1, Times(d1, ln));
        }

        // exp(u) with u = y log x: every derivative of exp is the value itself.
        return Chain(y * Log(x), value, value, value);
    }

    /// <summary>f(g) given f, f' and f'' at g's value.</summary>
    private static Jet Chain(Jet g, double f, double f1, double f2) =>
        new(f, Times(f1, g.D1), Times(f2, g.D1 * g.D1) + Times(f1, g.D2));

    // A product where an exactly zero factor wins over an infinite or NaN one: a term whose derivative
    // factor is zero does not depend on the variable, whatever the other factor is.
    private static double Times(double a, double b) => a == 0 || b == 0 ? 0 : a * b;

    // Likewise a zero derivative stays zero when divided by a constant zero.
    private static double Over(double derivative, double divisor) => derivative == 0 ? 0 : derivative / divisor;
}
