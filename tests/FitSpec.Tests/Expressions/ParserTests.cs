using FitSpec.Expressions;

namespace FitSpec.Tests.Expressions;

public sealed class ParserTests
{
    private static Expr ParseValue(string text)
    {
        var parsed = ExpressionParser.Parse(text, ExpressionContext.Value);
        Assert.True(parsed.Ok, string.Join("; ", parsed.Errors));
        return parsed.Root!;
    }

    private static double Value(string text) =>
        ExpressionEvaluator.EvaluateScalar(ParseValue(text), _ => throw new InvalidOperationException("no columns"));

    private static ExprError SingleError(string text, ExpressionContext context = ExpressionContext.Value)
    {
        var parsed = ExpressionParser.Parse(text, context);
        Assert.Null(parsed.Root);
        Assert.False(parsed.Ok);
        return Assert.Single(parsed.Errors);
    }

    [Theory]
    [InlineData("1 + 2 * 3", "1 + (2 * 3)")]
    [InlineData("1 - 2 - 3", "(1 - 2) - 3")]
    [InlineData("8 / 4 / 2", "(8 / 4) / 2")]
    [InlineData("-x^2", "-(x ^ 2)")]
    [InlineData("-x^2", "-(x^2)")]
    [InlineData("2^3^2", "2 ^ (3 ^ 2)")]
    [InlineData("2^-1", "2 ^ (-1)")]
    [InlineData("2^-x^2", "2 ^ (-(x ^ 2))")]
    [InlineData("a * -b", "a * (-b)")]
    [InlineData("a - -b", "a - (-b)")]
    [InlineData("+a", "+a")]
    [InlineData("-a * b", "(-a) * b")]
    [InlineData("a * b ^ c", "a * (b ^ c)")]
    [InlineData("(a + b) * c", "(a + b) * c")]
    [InlineData("a + b * c ^ d - e / f", "(a + (b * (c ^ d))) - (e / f)")]
    public void Precedence_matches_explicit_grouping(string text, string grouped) =>
        Assert.Equal(ParseValue(grouped).ToString(), ParseValue(text).ToString());

    [Fact]
    public void Rendering_shows_the_grouping()
    {
        Assert.Equal("-(x ^ 2)", ParseValue("-x^2").ToString());
        Assert.Equal("2 ^ (3 ^ 2)", ParseValue("2^3^2").ToString());
        Assert.Equal("`temp (C)` * 2", ParseValue("`temp (C)`*2").ToString());
    }

    [Fact]
    public void Power_is_right_associative_and_binds_tighter_than_sign()
    {
        Assert.Equal(512, Value("2^3^2"));
        Assert.Equal(-4, Value("-2^2"));
        Assert.Equal(0.5, Value("2^-1"));
        Assert.Equal(-9, Value("-(3^2)"));
        Assert.Equal(9, Value("(-3)^2"));
        Assert.Equal(7, Value("1 + 2 * 3"));
        Assert.Equal(1, Value("8 / 4 / 2"));
    }

    [Fact]
    public void Negated_power_holds_as_a_filter_on_every_row()
    {
        var parsed = ExpressionParser.Parse("-x^2 == -(x^2) and 2^3^2 == 512 and -x^2 != (-x)^2", ExpressionContext.Filter);
        Assert.True(parsed.Ok);
        var x = new[] { -2.0, -0.5, 0.5, 3.0 };
        Assert.Equal(new[] { 1.0, 1.0, 1.0, 1.0 }, ExpressionEvaluator.Evaluate(parsed.Root!, _ => x, x.Length));
    }

    [Theory]
    [InlineData("12", 12.0)]
    [InlineData("1.5", 1.5)]
    [InlineData("1e-3", 0.001)]
    [InlineData("2E+2", 200.0)]
    [InlineData(".5", 0.5)]
    [InlineData("3.", 3.0)]
    public void Numbers(string text, double expected) => Assert.Equal(expected, Value(text));

    [Fact]
    public void Every_function_parses_and_evaluates()
    {
        Assert.Equal(Math.Log(2.5), Value("log(2.5)"));
        Assert.Equal(Math.Exp(0.3), Value("exp(0.3)"));
        Assert.Equal(Math.Sqrt(7), Value("sqrt(7)"));
        Assert.Equal(3, Value("abs(-3)"));
        Assert.Equal(-1, Value("min(4, -1, 2)"));
        Assert.Equal(2, Value("min(2, 3)"));
        Assert.Equal(4, Value("max(4, -1, 2)"));
        Assert.Equal(3, Value("max(2, 3)"));

        var call = Assert.IsType<CallExpr>(ParseValue("max(a, b + 1, c)"));
        Assert.Equal(FunctionName.Max, call.Function);
        Assert.Equal(3, call.Arguments.Count);
    }

    [Fact]
    public void Names_and_backticks()
    {
        var parsed = ExpressionParser.Parse("`temp (C)` + _x1 * `and` - log", ExpressionContext.Value);
        Assert.True(parsed.Ok);
        Assert.Equal(["temp (C)", "_x1", "and", "log"], parsed.Columns.ToArray());
        Assert.False(parsed.IsConstant);

        var column = Assert.IsType<ColumnExpr>(ExpressionParser.Parse("  `a b`  ", ExpressionContext.Value).Root);
        Assert.Equal("a b", column.Name);
        Assert.Equal(2, column.Start);
        Assert.Equal(5, column.Length);
    }

    [Fact]
    public void Columns_are_distinct_ordinal_and_in_first_seen_order()
    {
        var parsed = ExpressionParser.Parse("b + a * B + b + log(a)", ExpressionContext.Value);
        Assert.Equal(["b", "a", "B"], parsed.Columns.ToArray());
        Assert.Contains("B", parsed.Columns);
        Assert.DoesNotContain("A", parsed.Columns);
        Assert.True(ExpressionParser.Parse("2 * exp(1)", ExpressionContext.Value).IsConstant);
        Assert.Empty(ExpressionParser.Parse("x +", ExpressionContext.Value).Columns);
    }

    [Fact]
    public void Spans_cover_the_source_including_parentheses()
    {
        const string text = "(a + b) * log(c)";
        var product = Assert.IsType<BinaryExpr>(ParseValue(text));
        Assert.Equal((0, text.Length), (product.Start, product.Length));
        Assert.Equal("(a + b)", text.Substring(product.Left.Start, product.Left.Length));
        Assert.Equal("log(c)", text.Substring(product.Right.Start, product.Right.Length));
        Assert.Equal(8, product.OperatorStart);
    }

    [Fact]
    public void Keywords_are_reserved()
    {
        Assert.Equal("expected an operand before 'and'", SingleError("and + 1").Message);
        Assert.True(ExpressionParser.Parse("`and` + `or` + `not`", ExpressionContext.Value).Ok);
        Assert.True(ExpressionParser.Parse("And + OR", ExpressionContext.Value).Ok);
    }

    [Fact]
    public void Filter_accepts_conditions()
    {
        foreach (var text in new[]
                 {
                     "x > 0", "x >= 0 and y < 3", "not x == 1", "x != 1 or y <= 2 and z > 0", "not (x > 0 or y > 0)",
                     "log(x) + 1 > y^2", "(x > 0)",
                 })
        {
            var parsed = ExpressionParser.Parse(text, ExpressionContext.Filter);
            Assert.True(parsed.Ok, text + ": " + string.Join("; ", parsed.Errors));
        }
    }

    [Fact]
    public void Logical_precedence_is_not_then_and_then_or()
    {
        var parsed = ExpressionParser.Parse("a > 0 or b > 0 and not c > 0", ExpressionContext.Filter);
        Assert.Equal("(a > 0) or ((b > 0) and (not (c > 0)))", parsed.Root!.ToString());
        Assert.IsType<NotExpr>(ExpressionParser.Parse("not a < b", ExpressionContext.Filter).Root);
    }

    [Fact]
    public void Value_context_rejects_comparisons_and_logic()
    {
        var error = SingleError("x + (y > 1)");
        Assert.Equal("comparisons are only allowed in a filter", error.Message);
        Assert.Equal((7, 1), (error.Offset, error.Length));

        Assert.Equal("comparisons are only allowed in a filter", SingleError("x >= 1").Message);
        var logic = SingleError("x > 0 and y > 0");
        Assert.Equal("'and' is only allowed in a filter", logic.Message);
        Assert.Equal((6, 3), (logic.Offset, logic.Length));
        Assert.Equal("'not' is only allowed in a filter", SingleError("not x > 0").Message);
    }

    [Fact]
    public void Filter_must_be_a_condition()
    {
        var error = SingleError("x", ExpressionContext.Filter);
        Assert.Equal("a filter must be a condition such as 'x > 0'", error.Message);
        Assert.Equal((0, 1), (error.Offset, error.Length));
        Assert.Equal(
            "a filter must be a condition such as 'x > 0'",
            SingleError("log(x) + 1", ExpressionContext.Filter).Message);
    }

    [Fact]
    public void Logical_operators_need_condition_operands()
    {
        var error = SingleError("x > 0 and y", ExpressionContext.Filter);
        Assert.Equal("'and' needs a condition on each side, such as 'x > 0'", error.Message);
        Assert.Equal((10, 1), (error.Offset, error.Length));
        Assert.Equal(
            "'or' needs a condition on each side, such as 'x > 0'",
            SingleError("a or b > 1", ExpressionContext.Filter).Message);
        Assert.Equal("'not' needs a condition, such as 'not x > 0'", SingleError("not x", ExpressionContext.Filter).Message);
    }

    [Fact]
    public void Filter_rejects_conditions_used_as_numbers()
    {
        var error = SingleError("(x > 0) + 1 > 0", ExpressionContext.Filter);
        Assert.StartsWith("a condition cannot be used as a number", error.Message, StringComparison.Ordinal);
        Assert.Equal((0, 7), (error.Offset, error.Length));
    }

    [Fact]
    public void Comparisons_do_not_chain()
    {
        var error = SingleError("a < b < c", ExpressionContext.Filter);
        Assert.StartsWith("comparisons cannot be chained", error.Message, StringComparison.Ordinal);
        Assert.Equal((6, 1), (error.Offset, error.Length));
    }

    [Fact]
    public void Relation_context_needs_exactly_one_top_level_comparison()
    {
        Assert.True(ExpressionParser.Parse("b0 + 2*b2 <= 1", ExpressionContext.Relation).Ok);
        Assert.True(ExpressionParser.Parse("(b1 >= 0)", ExpressionContext.Relation).Ok);
        Assert.Equal(
            "a constraint must be a comparison such as 'b1 >= 0'",
            SingleError("b1 + 1", ExpressionContext.Relation).Message);
        Assert.Equal(
            "only one comparison is allowed in a constraint",
            SingleError("b1 <= (b2 <= 1)", ExpressionContext.Relation).Message);
        var error = SingleError("b1 >= 0 and b2 >= 0", ExpressionContext.Relation);
        Assert.StartsWith("'and' is not allowed in a constraint", error.Message, StringComparison.Ordinal);
        Assert.Equal((8, 3), (error.Offset, error.Length));
    }

    [Theory]
    [InlineData("sin(x)", 0, 3, "unknown function 'sin' (allowed: log exp sqrt abs min max)")]
    [InlineData("1 + foo(x, y)", 4, 3, "unknown function 'foo' (allowed: log exp sqrt abs min max)")]
    [InlineData("Log(x)", 0, 3, "unknown function 'Log' (allowed: log exp sqrt abs min max); did you mean 'log'?")]
    [InlineData("ln(x)", 0, 2, "unknown function 'ln' (allowed: log exp sqrt abs min max); 'log' is the natural logarithm")]
    [InlineData("log(x, 2)", 0, 9, "'log' takes 1 argument, got 2")]
    [InlineData("2 * sqrt()", 4, 6, "'sqrt' takes 1 argument, got 0")]
    [InlineData("min(x)", 0, 6, "'min' takes at least 2 arguments, got 1")]
    [InlineData("x)", 1, 1, "unexpected ')'")]
    [InlineData(")", 0, 1, "unexpected ')'")]
    [InlineData("x +", 2, 1, "expected an operand after '+'")]
    [InlineData("x + * y", 4, 1, "expected an operand after '+'")]
    [InlineData("x * )", 4, 1, "expected an operand after '*'")]
    [InlineData("* y", 0, 1, "expected an operand before '*'")]
    [InlineData("x ^", 2, 1, "expected an operand after '^'")]
    [InlineData("`temp", 0, 5, "unterminated backtick-quoted name")]
    [InlineData("x + `", 4, 1, "unterminated backtick-quoted name")]
    [InlineData("``", 0, 2, "empty backtick-quoted name")]
    [InlineData("x $ y", 2, 1, "unexpected character '$'")]
    [InlineData("x = 1", 2, 1, "'=' is not an operator; use '==' to compare")]
    [InlineData("x && y", 2, 2, "'&&' is not an operator; use 'and'")]
    [InlineData("x ** 2", 2, 2, "'**' is not an operator; use '^' for powers")]
    [InlineData("(x + 1", 0, 1, "missing ')' to match this '('")]
    [InlineData("log(x", 3, 1, "missing ')' to match this '('")]
    [InlineData("()", 0, 2, "empty parentheses")]
    [InlineData("min(x,)", 5, 1, "expected an argument after ','")]
    [InlineData("x, y", 1, 1, "unexpected ','; commas only separate function arguments")]
    [InlineData("2x", 1, 1, "missing operator between '2' and 'x'")]
    [InlineData("x y", 2, 1, "missing operator between 'x' and 'y'")]
    [InlineData("1.2.3", 0, 5, "malformed number '1.2.3'")]
    [InlineData("1e999", 0, 5, "number '1e999' is too large")]
    [InlineData("x.y", 1, 1, "unexpected character '.'")]
    [InlineData("   ", 0, 3, "the expression is empty")]
    [InlineData("", 0, 0, "the expression is empty")]
    public void Errors_are_precise(string text, int offset, int length, string message)
    {
        var error = SingleError(text);
        Assert.Equal(message, error.Message);
        Assert.Equal(offset, error.Offset);
        Assert.Equal(length, error.Length);
    }

    [Fact]
    public void Unexpected_characters_outside_ascii()
    {
        var letter = SingleError("température");
        Assert.Equal(4, letter.Offset);
        Assert.StartsWith("unexpected character 'é' (names with other characters must be quoted", letter.Message, StringComparison.Ordinal);
        Assert.Equal("unexpected character U+0007", SingleError("x\a").Message);
        Assert.True(ExpressionParser.Parse("`température` * 2", ExpressionContext.Value).Ok);
    }

    [Fact]
    public void Null_text_is_an_error_not_an_exception()
    {
        var parsed = ExpressionParser.Parse(null!, ExpressionContext.Filter);
        Assert.Equal("", parsed.Text);
        Assert.Equal("the expression is empty", Assert.Single(parsed.Errors).Message);
    }

    [Fact]
    public void Several_errors_are_collected_in_offset_order()
    {
        var parsed = ExpressionParser.Parse("sin(x) + log(x, y) + min(z)", ExpressionContext.Value);
        Assert.Null(parsed.Root);
        Assert.Equal(
            [
                "unknown function 'sin' (allowed: log exp sqrt abs min max)",
                "'log' takes 1 argument, got 2",
                "'min' takes at least 2 arguments, got 1",
            ],
            parsed.Errors.Select(e => e.Message).ToArray());

        var lexical = ExpressionParser.Parse("$x + @", ExpressionContext.Value);
        Assert.Equal([0, 5], lexical.Errors.Select(e => e.Offset).ToArray());
    }

    [Fact]
    public void Deep_nesting_is_an_error_not_a_crash()
    {
        var ok = new string('(', Parser.MaxNesting - 1) + "x" + new string(')', Parser.MaxNesting - 1);
        Assert.True(ExpressionParser.Parse(ok, ExpressionContext.Value).Ok);

        foreach (var deep in new[]
                 {
                     new string('(', 100_000) + "x" + new string(')', 100_000),
                     new string('-', 100_000) + "x",
                     string.Join("^", Enumerable.Repeat("x", 100_000)),
                     string.Concat(Enumerable.Repeat("log(", 10_000)) + "x" + new string(')', 10_000),
                     string.Concat(Enumerable.Repeat("not ", 100_000)) + "x > 0",
                 })
        {
            var error = Assert.Single(ExpressionParser.Parse(deep, ExpressionContext.Filter).Errors);
            Assert.StartsWith("the expression is nested too deeply", error.Message, StringComparison.Ordinal);
        }
    }

    [Fact]
    public void Long_flat_chains_are_bounded_too()
    {
        var fine = string.Join(" + ", Enumerable.Range(0, 500).Select(i => $"x{i}"));
        var parsed = ExpressionParser.Parse(fine, ExpressionContext.Value);
        Assert.True(parsed.Ok);
        Assert.Equal(500, parsed.Columns.Count);

        var huge = string.Join(" + ", Enumerable.Repeat("x", 200_000));
        var error = Assert.Single(ExpressionParser.Parse(huge, ExpressionContext.Value).Errors);
        Assert.StartsWith("the expression is too long", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Rendering_parses_back_to_the_same_tree()
    {
        foreach (var text in new[] { "-x^2 + 3*y/(z - 1)", "max(a, -b, 2^-c) - `temp (C)`", "1e-05 * exp(-x)" })
        {
            var first = ParseValue(text).ToString();
            Assert.Equal(first, ParseValue(first).ToString());
        }
    }

    [Fact]
    public void Trees_compare_by_content()
    {
        Assert.Equal(ParseValue("min(a, b)"), ParseValue("min(a, b)"));
        Assert.NotEqual(ParseValue("min(a, b)"), ParseValue("min(b, a)"));
        Assert.Equal(
            ExpressionParser.Parse("x +", ExpressionContext.Value),
            ExpressionParser.Parse("x +", ExpressionContext.Value));
    }
}
