using FitSpec.Expressions;

namespace FitSpec.Tests.Expressions;

public sealed class EvaluatorTests
{
    private static Expr Parse(string text, ExpressionContext context = ExpressionContext.Value)
    {
        var parsed = ExpressionParser.Parse(text, context);
        Assert.True(parsed.Ok, string.Join("; ", parsed.Errors));
        return parsed.Root!;
    }

    private static Dictionary<string, double[]> SampleColumns(int rows, int seed)
    {
        var random = new Random(seed);
        double[] Make(Func<double> next) => Enumerable.Range(0, rows).Select(_ => next()).ToArray();
        var columns = new Dictionary<string, double[]>(StringComparer.Ordinal)
        {
            ["x"] = Make(() => (random.NextDouble() * 6) - 3),
            ["y"] = Make(() => (random.NextDouble() * 4) + 0.1),
            ["z"] = Make(() => random.Next(-2, 3)),
            ["temp (C)"] = Make(() => (random.NextDouble() * 40) - 10),
        };

        // Special values exercise IEEE behaviour in every kernel.
        columns["x"][0] = 0;
        columns["x"][1] = -0.0;
        columns["x"][2] = double.NaN;
        columns["x"][3] = double.PositiveInfinity;
        columns["x"][4] = -1;
        columns["y"][5] = 0;
        return columns;
    }

    [Theory]
    [InlineData("x", ExpressionContext.Value)]
    [InlineData("3", ExpressionContext.Value)]
    [InlineData("-x^2 + 3*y - z/2", ExpressionContext.Value)]
    [InlineData("x^2 + x^3 + x^4 + x^-1 + x^-2 + x^0 + x^1 + x^0.5 + y^x + 2^x + x^z", ExpressionContext.Value)]
    [InlineData("log(y) + exp(x) - sqrt(y) * abs(x)", ExpressionContext.Value)]
    [InlineData("log(x) + sqrt(x) + 1/x + x/0", ExpressionContext.Value)]
    [InlineData("min(x, y, z) + max(x, 2) - max(1, 2, 3) * min(y, x)", ExpressionContext.Value)]
    [InlineData("`temp (C)` * 1.8 + 32", ExpressionContext.Value)]
    [InlineData("+x - -y", ExpressionContext.Value)]
    [InlineData("2 * 3 + exp(1)", ExpressionContext.Value)]
    [InlineData("x > 0", ExpressionContext.Filter)]
    [InlineData("x >= y and z != 0 or not x < 1", ExpressionContext.Filter)]
    [InlineData("x == z or y <= 1", ExpressionContext.Filter)]
    [InlineData("not (x > 0 and y > 1)", ExpressionContext.Filter)]
    [InlineData("1 < 2", ExpressionContext.Filter)]
    public void Column_wise_agrees_with_scalar(string text, ExpressionContext context)
    {
        const int rows = 257;
        var columns = SampleColumns(rows, 42);
        var snapshot = columns.ToDictionary(c => c.Key, c => (double[])c.Value.Clone(), StringComparer.Ordinal);
        var root = Parse(text, context);

        var result = ExpressionEvaluator.Evaluate(root, name => columns[name], rows);

        Assert.Equal(rows, result.Length);
        for (var row = 0; row < rows; row++)
        {
            var scalar = ExpressionEvaluator.EvaluateScalar(root, name => columns[name][row]);
            var jet = ExpressionEvaluator.EvaluateJet(root, name => Jet.Variable(columns[name][row]));

            // Bit-for-bit: both paths share one set of scalar operations.
            Assert.Equal(BitConverter.DoubleToInt64Bits(scalar), BitConverter.DoubleToInt64Bits(result[row]));
            Assert.Equal(scalar, jet.Value);
        }

        foreach (var (name, values) in columns)
        {
            Assert.Equal(snapshot[name], values);
        }
    }

    [Fact]
    public void Random_expressions_agree_column_wise_and_scalar()
    {
        const int rows = 64;
        var columns = SampleColumns(rows, 3);
        var random = new Random(99);
        for (var n = 0; n < 300; n++)
        {
            var isFilter = n % 3 == 0;
            var text = isFilter ? RandomCondition(random, 3) : RandomValue(random, 4);
            var root = Parse(text, isFilter ? ExpressionContext.Filter : ExpressionContext.Value);
            var result = ExpressionEvaluator.Evaluate(root, name => columns[name], rows);
            for (var row = 0; row < rows; row++)
            {
                var scalar = ExpressionEvaluator.EvaluateScalar(root, name => columns[name][row]);
                Assert.True(
                    BitConverter.DoubleToInt64Bits(scalar) == BitConverter.DoubleToInt64Bits(result[row]),
                    $"{text} at row {row}: {scalar} vs {result[row]}");
            }
        }
    }

    private static string RandomValue(Random random, int depth)
    {
        if (depth == 0 || random.Next(4) == 0)
        {
            return random.Next(5) switch
            {
                0 => "x",
                1 => "y",
                2 => "z",
                3 => "`temp (C)`",
                _ => (random.Next(-3, 6) / 2.0).ToString(System.Globalization.CultureInfo.InvariantCulture),
            };
        }

        string Sub() => RandomValue(random, depth - 1);
        return random.Next(9) switch
        {
            0 => $"({Sub()} + {Sub()})",
            1 => $"({Sub()} - {Sub()})",
            2 => $"({Sub()} * {Sub()})",
            3 => $"({Sub()} / {Sub()})",
            4 => $"({Sub()} ^ {Sub()})",
            5 => $"(-{Sub()})",
            6 => $"{new[] { "log", "exp", "sqrt", "abs" }[random.Next(4)]}({Sub()})",
            7 => $"{(random.Next(2) == 0 ? "min" : "max")}({Sub()}, {Sub()}, {Sub()})",
            _ => $"({Sub()} ^ {random.Next(-2, 5)})",
        };
    }

    private static string RandomCondition(Random random, int depth)
    {
        if (depth == 0 || random.Next(3) == 0)
        {
            var op = new[] { "<", "<=", ">", ">=", "==", "!=" }[random.Next(6)];
            return $"({RandomValue(random, 2)} {op} {RandomValue(random, 2)})";
        }

        return random.Next(3) switch
        {
            0 => $"({RandomCondition(random, depth - 1)} and {RandomCondition(random, depth - 1)})",
            1 => $"({RandomCondition(random, depth - 1)} or {RandomCondition(random, depth - 1)})",
            _ => $"(not {RandomCondition(random, depth - 1)})",
        };
    }

    [Fact]
    public void A_bare_column_is_returned_as_is_and_each_column_is_requested_once()
    {
        var x = new[] { 1.0, 2.0, 3.0 };
        var requests = new List<string>();
        double[] Column(string name)
        {
            requests.Add(name);
            return x;
        }

        Assert.Same(x, ExpressionEvaluator.Evaluate(Parse("x"), Column, 3));
        Assert.Same(x, ExpressionEvaluator.Evaluate(Parse("+(x)"), Column, 3));
        requests.Clear();
        Assert.Equal(new[] { 3.0, 8.0, 15.0 }, ExpressionEvaluator.Evaluate(Parse("x * x + x * 2"), Column, 3));
        Assert.Equal(["x"], requests);
        Assert.Equal(new[] { 1.0, 2.0, 3.0 }, x);
    }

    [Fact]
    public void Constants_fill_the_result()
    {
        Assert.Equal(new[] { 7.0, 7.0 }, ExpressionEvaluator.Evaluate(Parse("1 + 2 * 3"), _ => [], 2));
        Assert.Empty(ExpressionEvaluator.Evaluate(Parse("1"), _ => [], 0));
    }

    [Fact]
    public void Conditions_are_one_or_zero_and_follow_ieee()
    {
        var x = new[] { -1.0, 0.0, 2.0, double.NaN };
        var result = ExpressionEvaluator.Evaluate(Parse("x > 0 or x == -1", ExpressionContext.Filter), _ => x, 4);
        Assert.Equal(new[] { 1.0, 0.0, 1.0, 0.0 }, result);
        Assert.Equal(
            new[] { 1.0, 1.0, 1.0, 1.0 },
            ExpressionEvaluator.Evaluate(Parse("x != 5", ExpressionContext.Filter), _ => x, 4));
        Assert.Equal(
            new[] { 1.0, 1.0, 0.0, 1.0 },
            ExpressionEvaluator.Evaluate(Parse("not x > 0", ExpressionContext.Filter), _ => x, 4));
    }

    [Fact]
    public void Arithmetic_is_ieee()
    {
        var x = new[] { -1.0, 0.0, 4.0 };
        var log = ExpressionEvaluator.Evaluate(Parse("log(x)"), _ => x, 3);
        Assert.True(double.IsNaN(log[0]));
        Assert.Equal(double.NegativeInfinity, log[1]);
        Assert.Equal(Math.Log(4), log[2]);
        var reciprocal = ExpressionEvaluator.Evaluate(Parse("1/x"), _ => x, 3);
        Assert.Equal(new[] { -1.0, double.PositiveInfinity, 0.25 }, reciprocal);
        Assert.True(double.IsNaN(ExpressionEvaluator.EvaluateScalar(Parse("min(x, 1)"), _ => double.NaN)));
    }

    [Fact]
    public void Small_integer_powers_multiply()
    {
        var x = new[] { 1.1, -3.7, 1e-3, 123.456 };
        Assert.Equal(x.Select(v => v * v).ToArray(), ExpressionEvaluator.Evaluate(Parse("x^2"), _ => x, 4));
        Assert.Equal(x.Select(v => v * v * v).ToArray(), ExpressionEvaluator.Evaluate(Parse("x^3"), _ => x, 4));
        Assert.Equal(x.Select(v => 1 / v).ToArray(), ExpressionEvaluator.Evaluate(Parse("x^-1"), _ => x, 4));
        Assert.Equal(x.Select(v => Math.Pow(v, 2.5)).ToArray(), ExpressionEvaluator.Evaluate(Parse("x^2.5"), _ => x, 4));
    }

    [Fact]
    public void Bad_columns_are_argument_errors()
    {
        Assert.Throws<ArgumentException>(() => ExpressionEvaluator.Evaluate(Parse("x + 1"), _ => new double[2], 3));
        Assert.Throws<ArgumentException>(() => ExpressionEvaluator.Evaluate(Parse("x + 1"), _ => null!, 3));
    }

    [Fact]
    public void A_million_rows_need_only_the_arrays_live_at_once()
    {
        const int rows = 1_000_000;
        var x = new double[rows];
        var y = new double[rows];
        for (var i = 0; i < rows; i++)
        {
            x[i] = (i % 997) / 997.0;
            y[i] = 1 + ((i % 991) / 991.0);
        }

        var root = Parse("log(y) * x^2 - 3 * x / y + max(x, 0.5) + exp(-x)");
        double[] Column(string name) => name == "x" ? x : y;

        // Warm up on a few rows so type loading and compilation are not counted below.
        ExpressionEvaluator.Evaluate(root, name => Column(name)[..4], 4);
        var before = GC.GetAllocatedBytesForCurrentThread();
        var result = ExpressionEvaluator.Evaluate(root, Column, rows);
        var allocated = GC.GetAllocatedBytesForCurrentThread() - before;

        Assert.Equal(rows, result.Length);
        Assert.Equal(
            (Math.Log(y[123]) * x[123] * x[123]) - (3 * x[123] / y[123]) + Math.Max(x[123], 0.5) + Math.Exp(-x[123]),
            result[123],
            12);

        // Thirteen nodes, but intermediates are overwritten in place or recycled: at most two arrays are live at
        // once. Per-row boxing or per-row temporaries would show up here as many times more.
        Assert.InRange(allocated, 2L * rows * sizeof(double), (2L * rows * sizeof(double)) + 65_536);
    }
}
