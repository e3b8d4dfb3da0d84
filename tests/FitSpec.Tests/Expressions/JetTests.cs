using FitSpec.Expressions;

namespace FitSpec.Tests.Expressions;

public sealed class JetTests
{
    private static Jet At(string text, double x, double other = 0.7)
    {
        var parsed = ExpressionParser.Parse(text, ExpressionContext.Value);
        Assert.True(parsed.Ok, string.Join("; ", parsed.Errors));
        return ExpressionEvaluator.EvaluateJet(parsed.Root!, name => name == "x" ? Jet.Variable(x) : Jet.Constant(other));
    }

    private static void AssertJet(Jet actual, double value, double d1, double d2)
    {
        // Relative tolerances: the analytic forms round differently from the forward-mode ones.
        Assert.Equal(value, actual.Value, 1e-12 * Math.Max(1, Math.Abs(value)));
        Assert.Equal(d1, actual.D1, 1e-10 * Math.Max(1, Math.Abs(d1)));
        Assert.Equal(d2, actual.D2, 1e-10 * Math.Max(1, Math.Abs(d2)));
    }

    public static TheoryData<double> Points => new() { 0.3, 1.0, 2.5, 7.25 };

    [Theory]
    [MemberData(nameof(Points))]
    public void Cube(double x) => AssertJet(At("x^3", x), x * x * x, 3 * x * x, 6 * x);

    [Theory]
    [MemberData(nameof(Points))]
    public void Exp_times_x(double x) =>
        AssertJet(At("exp(x) * x", x), Math.Exp(x) * x, Math.Exp(x) * (x + 1), Math.Exp(x) * (x + 2));

    [Theory]
    [MemberData(nameof(Points))]
    public void Log_over_x(double x) =>
        AssertJet(
            At("log(x) / x", x),
            Math.Log(x) / x,
            (1 - Math.Log(x)) / (x * x),
            ((2 * Math.Log(x)) - 3) / (x * x * x));

    [Theory]
    [MemberData(nameof(Points))]
    public void Square_root(double x) =>
        AssertJet(At("sqrt(x)", x), Math.Sqrt(x), 0.5 / Math.Sqrt(x), -0.25 / (x * Math.Sqrt(x)));

    [Theory]
    [MemberData(nameof(Points))]
    public void Reciprocal(double x) => AssertJet(At("1 / x", x), 1 / x, -1 / (x * x), 2 / (x * x * x));

    [Theory]
    [MemberData(nameof(Points))]
    public void General_powers(double x)
    {
        AssertJet(At("x^2.5", x), Math.Pow(x, 2.5), 2.5 * Math.Pow(x, 1.5), 2.5 * 1.5 * Math.Pow(x, 0.5));
        AssertJet(At("2^x", x), Math.Pow(2, x), Math.Pow(2, x) * Math.Log(2), Math.Pow(2, x) * Math.Log(2) * Math.Log(2));

        // d/dx x^x = x^x (ln x + 1); d2 = x^x ((ln x + 1)^2 + 1/x).
        var l = Math.Log(x) + 1;
        AssertJet(At("x^x", x), Math.Pow(x, x), Math.Pow(x, x) * l, Math.Pow(x, x) * ((l * l) + (1 / x)));
    }

    [Theory]
    [MemberData(nameof(Points))]
    public void Composition_and_constants(double x)
    {
        const double c = 0.7;
        var u = (c * x * x) - x;
        AssertJet(At("exp(y*x^2 - x)", x), Math.Exp(u), Math.Exp(u) * ((2 * c * x) - 1), Math.Exp(u) * ((((2 * c * x) - 1) * ((2 * c * x) - 1)) + (2 * c)));
        AssertJet(At("-(x - y)^2", x), -(x - c) * (x - c), -2 * (x - c), -2);
        AssertJet(At("log(x^2 + y)", x), Math.Log((x * x) + c), 2 * x / ((x * x) + c), ((2 * c) - (2 * x * x)) / (((x * x) + c) * ((x * x) + c)));
    }

    [Fact]
    public void Integer_powers_at_zero_are_finite()
    {
        AssertJet(At("x^1", 0), 0, 1, 0);
        AssertJet(At("x^2", 0), 0, 0, 2);
        AssertJet(At("x^3", 0), 0, 0, 0);
        AssertJet(At("x^0", 0), 1, 0, 0);
        AssertJet(At("x^5", 0), 0, 0, 0);
    }

    [Fact]
    public void Kinks_use_the_active_branch()
    {
        AssertJet(At("abs(x)", -2), 2, -1, 0);
        AssertJet(At("abs(x)", 3), 3, 1, 0);
        AssertJet(At("abs(x)", 0), 0, 1, 0);
        AssertJet(At("min(x^2, y)", 0.5), 0.25, 1, 2);
        AssertJet(At("min(x^2, y)", 2), 0.7, 0, 0);
        AssertJet(At("max(x^2, y, 3*x)", 2), 6, 3, 0);
    }

    [Fact]
    public void Constants_have_no_derivatives()
    {
        AssertJet(At("y^2 + log(y) * 3", 1.5), (0.7 * 0.7) + (Math.Log(0.7) * 3), 0, 0);
        var constantOverZero = Jet.Constant(1) / Jet.Constant(0);
        Assert.Equal(double.PositiveInfinity, constantOverZero.Value);
        Assert.Equal(0, constantOverZero.D1);
    }

    [Fact]
    public void Conditions_are_constant_jets()
    {
        var parsed = ExpressionParser.Parse("x > 1 and x < 3", ExpressionContext.Filter);
        Assert.Equal(Jet.Constant(1), ExpressionEvaluator.EvaluateJet(parsed.Root!, _ => Jet.Variable(2)));
        Assert.Equal(Jet.Constant(0), ExpressionEvaluator.EvaluateJet(parsed.Root!, _ => Jet.Variable(5)));
    }

    [Fact]
    public void Jet_operators_directly()
    {
        var x = Jet.Variable(2);
        var three = Jet.Constant(3);
        Assert.Equal(new Jet(6, 3, 0), x * three);
        Assert.Equal(new Jet(5, 1, 0), x + three);
        Assert.Equal(new Jet(-1, 1, 0), x - three);
        Assert.Equal(new Jet(-2, -1, 0), -x);
        Assert.Equal(new Jet(4, 4, 2), x * x);
        Assert.Equal(new Jet(8, 12, 12), Jet.Pow(x, 3));
        Assert.Equal(Jet.Pow(x, 3), Jet.Pow(x, three));
    }
}
