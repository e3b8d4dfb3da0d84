using FitSpec.Expressions;

namespace FitSpec.Tests.Expressions;

public sealed class LinearizerTests
{
    private static LinearRelation Linear(string text)
    {
        var (relation, errors) = Linearizer.Linearize(text);
        Assert.True(errors.Count == 0, string.Join("; ", errors));
        return relation!;
    }

    private static ExprError SingleError(string text)
    {
        var (relation, errors) = Linearizer.Linearize(text);
        Assert.Null(relation);
        return Assert.Single(errors);
    }

    private static KeyValuePair<string, double> T(string name, double coefficient) => new(name, coefficient);

    [Fact]
    public void Single_bound() =>
        Assert.Equal(new LinearRelation([T("b1", 1)], RelationOperator.GreaterOrEqual, 0), Linear("b1 >= 0"));

    [Fact]
    public void Sum_with_coefficient() =>
        Assert.Equal(new LinearRelation([T("b0", 1), T("b2", 2)], RelationOperator.LessOrEqual, 1), Linear("b0 + 2*b2 <= 1"));

    [Fact]
    public void Distributes_over_parentheses() =>
        Assert.Equal(new LinearRelation([T("b1", 2), T("b0", -2)], RelationOperator.Equal, 0.5), Linear("2*(b1 - b0) == 0.5"));

    [Fact]
    public void Moves_names_left_and_numbers_right() =>
        Assert.Equal(new LinearRelation([T("b1", 0.5), T("b2", -1)], RelationOperator.LessOrEqual, 1), Linear("b1/2 <= b2 + 1"));

    [Fact]
    public void Keeps_the_users_sign() =>
        Assert.Equal(new LinearRelation([T("b1", -1)], RelationOperator.GreaterOrEqual, -3), Linear("-b1 >= -3"));

    [Theory]
    [InlineData("3 <= b1", RelationOperator.GreaterOrEqual, 3)]
    [InlineData("3 >= b1", RelationOperator.LessOrEqual, 3)]
    [InlineData("3 == b1", RelationOperator.Equal, 3)]
    [InlineData("3 <= b1 + 1", RelationOperator.GreaterOrEqual, 2)]
    [InlineData("2^3 - 1 >= b1", RelationOperator.LessOrEqual, 7)]
    public void Flips_when_names_are_only_on_the_right(string text, RelationOperator op, double constant) =>
        Assert.Equal(new LinearRelation([T("b1", 1)], op, constant), Linear(text));

    [Fact]
    public void Combines_like_terms_in_order_of_first_appearance()
    {
        Assert.Equal(
            new LinearRelation([T("b2", 3), T("b1", -1)], RelationOperator.LessOrEqual, 4),
            Linear("b2 + 1 + 2*b2 <= b1 + 5"));
        Assert.Equal(
            new LinearRelation([T("b3", 1)], RelationOperator.Equal, 0),
            Linear("b1 + b3 - b1 == 0"));
        Assert.Equal(
            new LinearRelation([T("a", 1), T("A", 1)], RelationOperator.LessOrEqual, 0),
            Linear("a + A <= 0"));
    }

    [Fact]
    public void Constant_arithmetic_and_quoted_names()
    {
        Assert.Equal(
            new LinearRelation([T("x:z", 6)], RelationOperator.LessOrEqual, 0.25),
            Linear("(1 + 2) * `x:z` * 2 <= 2^-2"));
        Assert.Equal(
            new LinearRelation([T("b1", 1.0 / 3)], RelationOperator.GreaterOrEqual, 0),
            Linear("b1 / 3 >= -0"));
        Assert.Equal(0.0, BitConverter.DoubleToInt64Bits(Linear("b1 <= -0").Constant));
    }

    [Fact]
    public void Renders_as_source()
    {
        Assert.Equal("2*b1 - 2*b0 == 0.5", Linear("2*(b1 - b0) == 0.5").ToString());
        Assert.Equal("-b1 >= -3", Linear("-b1 >= -3").ToString());
        Assert.Equal("`x:z` + b2 <= 1", Linear("`x:z` + b2 <= 1").ToString());
    }

    [Theory]
    [InlineData("b1*b2 <= 1", 0, 5, "'b1*b2' is not linear: a product of two coefficients")]
    [InlineData("2 + (b1 + 1)*b2 >= 0", 4, 11, "'(b1 + 1)*b2' is not linear: a product of two coefficients")]
    [InlineData("b1 / b2 <= 1", 5, 2, "division by a coefficient is not linear")]
    [InlineData("b1 / (2 - 2) <= 1", 5, 7, "division by zero")]
    [InlineData("b1^2 <= 1", 0, 4, "'b1^2' is not linear: a power of a coefficient")]
    [InlineData("2^b1 <= 1", 0, 4, "'2^b1' is not linear: a coefficient in an exponent")]
    [InlineData("log(b1) <= 1", 0, 7, "functions are not allowed in a linear constraint")]
    [InlineData("b1 + max(1, 2) <= 1", 5, 9, "functions are not allowed in a linear constraint")]
    [InlineData("b1 < 1", 3, 1, "'<' is not allowed in a constraint (use '<=')")]
    [InlineData("b1 > 1", 3, 1, "'>' is not allowed in a constraint (use '>=')")]
    [InlineData("b1 != 1", 3, 2, "'!=' is not allowed in a constraint (use '<=', '>=' or '==')")]
    [InlineData("1 <= 2", 0, 6, "a constraint must mention at least one coefficient")]
    [InlineData("b1 <= b1 + 1", 0, 12, "the coefficients cancel out, so the constraint does not depend on any coefficient")]
    [InlineData("b1", 0, 2, "a constraint must be a comparison such as 'b1 >= 0'")]
    [InlineData("b1 >= 0 and b2 >= 0", 8, 3, "'and' is not allowed in a constraint; write each constraint separately")]
    [InlineData("b1 >= ", 3, 2, "expected an operand after '>='")]
    [InlineData("1e300 * 1e300 * b1 <= 1", 0, 23, "the constraint's numbers are too large (not finite)")]
    public void Errors_point_at_the_problem(string text, int offset, int length, string message)
    {
        var error = SingleError(text);
        Assert.Equal(message, error.Message);
        Assert.Equal((offset, length), (error.Offset, error.Length));
    }

    [Fact]
    public void Several_problems_are_all_reported()
    {
        var (relation, errors) = Linearizer.Linearize("b1*b2 + log(b3) < b4/b5");
        Assert.Null(relation);
        Assert.Equal(
            [
                "'b1*b2' is not linear: a product of two coefficients",
                "functions are not allowed in a linear constraint",
                "'<' is not allowed in a constraint (use '<=')",
                "division by a coefficient is not linear",
            ],
            errors.Select(e => e.Message).ToArray());
    }

    [Fact]
    public void Null_text_is_an_error()
    {
        var (relation, errors) = Linearizer.Linearize(null!);
        Assert.Null(relation);
        Assert.Equal("the expression is empty", Assert.Single(errors).Message);
    }
}
