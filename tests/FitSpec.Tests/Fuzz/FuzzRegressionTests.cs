using System.Diagnostics;
using System.Text;
using FitSpec.Design;
using FitSpec.Diagnostics;
using FitSpec.Expressions;
using FitSpec.Spec;

namespace FitSpec.Tests.Fuzz;

/// <summary>
/// Every failure the fuzzer found, as the shrunk input it was saved as (or the input it was shrunk to, written
/// out where it is too long to inline), together with the limits the task asked for by name. Each test says
/// what the input did before its fix.
/// </summary>
public sealed class FuzzRegressionTests
{
    private static SpecReadResult Parse(string yaml) => SpecReader.Parse("fuzz.fit.yaml", Encoding.UTF8.GetBytes(yaml));

    private static string Repeat(string piece, int times) => string.Concat(Enumerable.Repeat(piece, times));

    private static Diagnostic SingleLocatedError(SpecReadResult read)
    {
        Assert.Null(read.Document);
        var error = Assert.Single(read.Errors);
        Assert.True(error.Line >= 1 && error.Column >= 1, error.ToString());
        return error;
    }

    // Found by the spec target (a value wrapped in 100,000 '['): the tree loader recursed once per level and
    // overflowed the stack, which ends the whole process, past any catch.
    [Fact]
    public void Flow_lists_nested_100000_deep_are_a_located_error_not_a_stack_overflow()
    {
        var error = SingleLocatedError(Parse("fitspec: 1\nx: " + Repeat("[", 100_000) + "1" + Repeat("]", 100_000) + "\n"));
        Assert.Equal(2, error.Line);
        Assert.Contains("nested more than 100 levels", error.Message, StringComparison.Ordinal);
    }

    // The same overflow through flow mappings and through block lists on one line ("- - - ... x").
    [Theory]
    [InlineData("k: ", "{a: ", "}")]
    [InlineData("k:\n  ", "- ", "")]
    public void Other_deep_nesting_is_a_located_error_too(string key, string open, string close)
    {
        var error = SingleLocatedError(Parse("fitspec: 1\n" + key + Repeat(open, 100_000) + "x" + Repeat(close, 100_000) + "\n"));
        Assert.Contains("nested more than", error.Message, StringComparison.Ordinal);
    }

    // Found by the spec target: nine anchors that each repeat the previous one ten times. Reading it walked
    // the expanded tree (10^9 nodes) when checking tags; the walk now stops at the alias that goes over the cap.
    [Fact]
    public void An_alias_bomb_is_refused_at_the_alias_that_overflows_the_cap_in_bounded_time()
    {
        var yaml = new StringBuilder("fitspec: 1\nb0: &b0 [lol, lol, lol, lol, lol, lol, lol, lol, lol, lol]\n");
        for (var level = 1; level < 9; level++)
        {
            yaml.Append($"b{level}: &b{level} [{string.Join(", ", Enumerable.Repeat($"*b{level - 1}", 10))}]\n");
        }

        yaml.Append("model: *b8\n");
        var clock = Stopwatch.StartNew();
        var error = SingleLocatedError(Parse(yaml.ToString()));
        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(5), $"took {clock.Elapsed}");
        Assert.Contains("aliases ('*name') repeat more than", error.Message, StringComparison.Ordinal);
        Assert.Equal(5, error.Line);
    }

    // Found by the long spec run (a composed spec with the snippet "&a [x, *a]" as a key): an alias inside the
    // list it names makes the tree a cycle, and the YAML library hashed that key until the stack overflowed.
    [Theory]
    [InlineData("fitspec: 1\n&a [x, *a]:\n  - 1\n", 2)]
    [InlineData("fitspec: 1\nmodel: &m {terms: *m}\n", 2)]
    [InlineData("fitspec: 1\nk: &a [1, [2, [3, *a]]]\n", 2)]
    public void An_alias_inside_the_value_it_names_is_a_located_error_not_a_stack_overflow(string yaml, int line)
    {
        var error = SingleLocatedError(Parse(yaml));
        Assert.Equal(line, error.Line);
        Assert.Contains("inside the value it names", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void An_anchor_redefined_inside_its_namesake_is_no_cycle()
    {
        var read = Parse("fitspec: 1\ndata: {path: d.csv}\nmodel: &a\n  response: y\n  terms:\n    b0: &a 1\n    b1: *a\n");
        Assert.Empty(read.Errors);
        Assert.Equal(2, read.Document!.Model.Terms.Count);
    }

    // A repeated mapping key that is a list: the YAML library quotes the whole (expanded) key in its message.
    [Fact]
    public void A_repeated_list_key_gives_a_one_line_message()
    {
        var read = Parse("fitspec: 1\na: &a [" + string.Join(", ", Enumerable.Repeat("long-value", 200)) + "]\n? *a\n: 1\n? *a\n: 2\n");
        var error = SingleLocatedError(read);
        Assert.True(error.Message.Length < 300, error.Message);
    }

    [Fact]
    public void Anchors_and_aliases_in_ordinary_use_still_read()
    {
        var read = Parse("""
            fitspec: 1
            data: {path: d.csv}
            model: {response: y, terms: {b0: 1, b1: x}}
            constraints:
              - {kind: increasing, in: x, over: &range [0, 10]}
              - {kind: convex, in: x, over: *range}
            """);
        Assert.Empty(read.Errors);
        Assert.Equal(2, read.Document!.Constraints.Count);
    }

    [Theory]
    [InlineData("data: !!python/object:os.system {path: a.csv}", "tag:yaml.org,2002:python/object:os.system")]
    [InlineData("data: {path: !!python/object/apply:subprocess.check_output a.csv}", "python/object/apply")]
    [InlineData("data: {path: !custom a.csv}", "!custom")]
    public void Custom_tags_are_refused_with_a_located_error(string line, string tag)
    {
        var error = SingleLocatedError(Parse($"fitspec: 1\n{line}\nmodel: {{response: y, terms: {{b0: 1}}}}\n"));
        Assert.Equal(2, error.Line);
        Assert.Contains(tag, error.Message, StringComparison.Ordinal);
        Assert.Contains("not allowed", error.Message, StringComparison.Ordinal);
    }

    // Found by the expression target (shrunk from 100,000 comparisons): each extra comparison was its own
    // error, and the spec compiler quotes the whole expression in every message, so a 400 kB filter built
    // 100,000 messages of 400 kB each and never finished.
    [Fact]
    public void A_100000_long_comparison_chain_reports_ten_errors_and_compiles_quickly()
    {
        var text = Repeat("x < ", 100_000) + "1";
        var parsed = ExpressionParser.Parse(text, ExpressionContext.Filter);
        Assert.Equal(ExpressionParser.MaxErrors, parsed.Errors.Count);
        Assert.Contains("more errors after this one", parsed.Errors[^1].Message, StringComparison.Ordinal);

        var clock = Stopwatch.StartNew();
        var spec = Parse($"fitspec: 1\ndata:\n  path: d.csv\n  filter: \"{text}\"\nmodel: {{response: y, terms: {{b0: 1}}}}\n").Document!;
        var refused = Assert.Throws<FitSpecException>(() => ModelCompiler.Compile(spec));
        Assert.Equal(ExpressionParser.MaxErrors, refused.Diagnostics.Count);
        Assert.All(refused.Diagnostics, d => Assert.Equal(4, d.Line));
        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(10), $"took {clock.Elapsed}");
    }

    [Fact]
    public void Parentheses_nested_100000_deep_are_a_clean_error()
    {
        var text = Repeat("(", 100_000) + "x" + Repeat(")", 100_000);
        foreach (var context in Enum.GetValues<ExpressionContext>())
        {
            var parsed = ExpressionParser.Parse(text, context);
            Assert.Null(parsed.Root);
            var error = Assert.Single(parsed.Errors);
            Assert.Contains("nested too deeply", error.Message, StringComparison.Ordinal);
        }
    }

    // Found by the expression target: "(exp(exp(8)/(min(_,x,1))))" with _ = 0 and x = -0. Math.Min(0, -0) is -0,
    // so the scalar and column-wise evaluators divide by -0 and get exp(-inf) = 0; the jet's min kept the first
    // argument on a tie, divided by +0 and got infinity.
    [Theory]
    [InlineData("exp(exp(8)/(min(a,b,1)))", 0.0, -0.0, 0.0)]
    [InlineData("exp(exp(8)/(min(b,a,1)))", 0.0, -0.0, 0.0)]
    [InlineData("exp(-exp(8)/(max(b,a,-1)))", 0.0, -0.0, 0.0)]
    [InlineData("1/max(b,a)", 0.0, -0.0, double.PositiveInfinity)]
    [InlineData("1/min(a,b)", 0.0, -0.0, double.NegativeInfinity)]
    public void Min_and_max_of_signed_zeros_agree_across_the_evaluators(string text, double a, double b, double expected)
    {
        var root = ExpressionParser.Parse(text, ExpressionContext.Value).Root!;
        double Value(string name) => name == "a" ? a : b;
        Assert.Equal(expected, ExpressionEvaluator.EvaluateScalar(root, Value));
        Assert.Equal(expected, ExpressionEvaluator.EvaluateJet(root, name => Jet.Variable(Value(name))).Value);
        Assert.Equal(expected, ExpressionEvaluator.Evaluate(root, name => [Value(name)], 1)[0]);
    }

    // Found by a composed spec in a full fit: 'knots: 2147483647' passed the reader (the grammar has no upper
    // bound) and the design stage threw OutOfMemoryException allocating the breakpoints.
    [Theory]
    [InlineData("{spline: x, knots: 2147483647}")]
    [InlineData("{spline: x, knots: 10001, degree: 1}")]
    public void A_spline_with_more_knots_than_the_cap_is_a_located_error(string term)
    {
        var error = SingleLocatedError(Parse($"fitspec: 1\ndata: {{path: d.csv}}\nmodel:\n  response: y\n  terms:\n    s: {term}\n"));
        Assert.Equal("model.terms.s.knots", error.Field);
        Assert.Contains("at most 10000 knots", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_spline_listing_more_knots_than_the_cap_is_a_located_error()
    {
        var at = string.Join(", ", Enumerable.Range(0, 10_001));
        var error = SingleLocatedError(Parse($"fitspec: 1\ndata: {{path: d.csv}}\nmodel:\n  response: y\n  terms:\n    s: {{spline: x, at: [{at}]}}\n"));
        Assert.Equal("model.terms.s.at", error.Field);
    }
}
