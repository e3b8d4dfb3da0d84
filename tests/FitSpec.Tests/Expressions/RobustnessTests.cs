using System.Text;
using FitSpec.Expressions;

namespace FitSpec.Tests.Expressions;

public sealed class RobustnessTests
{
    private static readonly string[] Seeds =
    [
        "b0 + 2*b2 <= 1",
        "-x^2 + log(`temp (C)`) * max(a, b, 3)",
        "x > 0 and not (y <= 2 or z != 1)",
        "2^-1^2 / sqrt(abs(x - 1e-3))",
        "min(.5, x) == exp(y)",
        "3 <= b1 / 2",
    ];

    private static readonly string[] Fragments =
    [
        "(", ")", "`", ",", "+", "-", "*", "/", "^", "<", "<=", ">", ">=", "==", "!=", "=", "!", "&&", " and ", " or ",
        " not ", "log(", "min(", "sin(", "1e", "1e999", ".", "..", "1.2.3", "x", "`a b`", " ", "$", "\u00e9", "\0",
        "\uD800", "0", "9.5", "e", "max(x,", "))", "((",
    ];

    [Fact]
    public void Random_and_mutated_text_never_throws()
    {
        var random = new Random(20240611);
        var contexts = Enum.GetValues<ExpressionContext>();
        for (var i = 0; i < 4000; i++)
        {
            var text = i % 2 == 0 ? Mutate(Seeds[random.Next(Seeds.Length)], random) : Assemble(random);
            foreach (var context in contexts)
            {
                var parsed = ExpressionParser.Parse(text, context);
                AssertWellFormed(text, parsed);
                if (parsed.Ok)
                {
                    // A tree the parser accepts must evaluate without throwing.
                    ExpressionEvaluator.EvaluateScalar(parsed.Root!, _ => 1.5);
                    ExpressionEvaluator.EvaluateJet(parsed.Root!, _ => Jet.Variable(0.5));
                }
            }

            var (relation, errors) = Linearizer.Linearize(text);
            Assert.True((relation is null) != (errors.Count == 0), text);
            foreach (var error in errors)
            {
                AssertInside(text, error);
            }
        }
    }

    private static void AssertWellFormed(string text, ParsedExpression parsed)
    {
        Assert.Equal(parsed.Ok, parsed.Errors.Count == 0);
        Assert.Equal(parsed.Root is not null, parsed.Errors.Count == 0);
        foreach (var error in parsed.Errors)
        {
            AssertInside(text, error);
            Assert.False(string.IsNullOrWhiteSpace(error.Message));
        }

        if (parsed.Root is { } root)
        {
            Assert.InRange(root.Start, 0, text.Length);
            Assert.InRange(root.End, root.Start, text.Length);
        }
    }

    private static void AssertInside(string text, ExprError error)
    {
        Assert.InRange(error.Offset, 0, text.Length);
        Assert.InRange(error.Length, 0, text.Length - error.Offset);
    }

    private static string Mutate(string seed, Random random)
    {
        var builder = new StringBuilder(seed);
        var edits = random.Next(1, 4);
        for (var e = 0; e < edits; e++)
        {
            var at = random.Next(builder.Length + 1);
            switch (random.Next(3))
            {
                case 0 when builder.Length > 0 && at < builder.Length:
                    builder.Remove(at, random.Next(1, Math.Min(4, builder.Length - at) + 1));
                    break;
                case 1:
                    builder.Insert(at, Fragments[random.Next(Fragments.Length)]);
                    break;
                default:
                    builder.Insert(at, (char)random.Next(0, 128));
                    break;
            }
        }

        return builder.ToString();
    }

    private static string Assemble(Random random)
    {
        var builder = new StringBuilder();
        var count = random.Next(0, 12);
        for (var i = 0; i < count; i++)
        {
            builder.Append(Fragments[random.Next(Fragments.Length)]);
        }

        return builder.ToString();
    }
}
