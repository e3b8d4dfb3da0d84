using System.Globalization;
using System.Text;
using CsCheck;

namespace FitSpec.Fuzz.Mutation;

/// <summary>
/// Generators of expression text: random trees of the language (and of near-misses: unknown functions,
/// operators from other languages, chained comparisons), nesting far past any limit, and edge-case arithmetic
/// (division by zero, overflow, logs of zero, huge literals).
/// </summary>
public static class ExpressionGen
{
    public static IReadOnlyList<byte[]> Snippets { get; } =
    [
        .. new[]
        {
            "(", ")", "`", ",", "+", "-", "*", "/", "^", "<", "<=", ">", ">=", "==", "!=", "=", "!", "&&", " and ", " or ",
            " not ", "log(", "min(", "max(", "sin(", "ln(", "pow(", "1e", "1e999", "1e308", "4.9e-324", ".", "..", "1.2.3",
            "x", "`a b`", "`temp (C)`", " ", "$", "\u00e9", "\0", "\uD800", "\u0661", "0", "9.5", "e", "max(x,", "))", "((",
            "^-", "**", "<>", "=>", "||", "|", "&", "`", "``", "\t", "\n", "/0", "^0.5", "^-1", "^1e308", "abs(", "exp(",
            "sqrt(", "-(", "not not ", "x>0", "1/(1-1)",
        }.Select(Encoding.UTF8.GetBytes),
    ];

    /// <summary>
    /// Random expressions up to <paramref name="depth"/> levels with random spacing. Noisy trees also draw
    /// near-misses (unknown functions, operators of other languages, out-of-range literals), which most
    /// often make the whole text invalid, so they are kept apart from the clean ones.
    /// </summary>
    public static Gen<string> Tree(int depth, bool noisy)
    {
        var atom = Gen.Frequency(
            (4, Gen.OneOf("x", "y", "z", "w", "b1", "`temp (C)`", "`a b`", "_x", "X1", "`x`")),
            (3, Gen.OneOf("0", "1", "2", "0.5", ".5", "5.", "1e3", "1E-3", "2.5e+2", "1e308", "4.9e-324", "1e-400", "007")),
            (1, Gen.Int[0, 1_000_000].Select(i => i.ToString(CultureInfo.InvariantCulture))),
            (1, Gen.Double.Select(d => Math.Abs(d).ToString("R", CultureInfo.InvariantCulture))));
        var space = Gen.OneOf("", " ", "  ", "\t");
        var arithmetic = Gen.OneOf("+", "-", "*", "/", "^", "^-");
        var unary = Gen.OneOf("log", "exp", "sqrt", "abs");
        var variadic = Gen.OneOf("min", "max");
        var prefix = Gen.OneOf("-", "+", "- -");
        if (noisy)
        {
            atom = Gen.Frequency((8, atom), (1, Gen.OneOf("unknown_col", "1e309", "1.2.3", "`", "$x", "\u00e9")));
            arithmetic = Gen.Frequency((8, arithmetic), (1, Gen.OneOf("**", "%", "=", "<>", "&&", "<")));
            unary = Gen.Frequency((8, unary), (1, Gen.OneOf("sin", "ln", "pow", "Log", "MAX", "f", "", "min")));
            variadic = Gen.Frequency((8, variadic), (1, Gen.OneOf("log", "atan2", "hypot")));
            prefix = Gen.Frequency((8, prefix), (1, Gen.OneOf("!", "not ", "~")));
        }

        var levels = new Gen<string>[depth + 1];
        levels[0] = atom;
        for (var d = 1; d <= depth; d++)
        {
            var sub = levels[d - 1];
            levels[d] = Gen.Frequency(
                (3, atom),
                (4, Gen.Select(sub, space, arithmetic, space, sub, (a, s1, op, s2, b) => $"{a}{s1}{op}{s2}{b}")),
                (2, sub.Select(a => $"({a})")),
                (2, Gen.Select(unary, sub, (f, a) => $"{f}({a})")),
                (1, Gen.Select(variadic, sub.Array[2, 4], (f, args) => $"{f}({string.Join(", ", args)})")),
                (1, Gen.Select(prefix, sub, (p, a) => p + a)));
        }

        return levels[depth];
    }

    /// <summary>Conditions for filters: comparisons of value trees, combined with and, or, not.</summary>
    public static Gen<string> Condition(Gen<string> value)
    {
        var comparison = Gen.Select(value, Gen.OneOf("<", "<=", ">", ">=", "==", "!="), value, (a, op, b) => $"{a} {op} {b}");
        var logic = Gen.Select(comparison, Gen.OneOf(" and ", " or "), comparison, (a, op, b) => $"{a}{op}{b}");
        return Gen.Frequency(
            (4, comparison),
            (2, logic),
            (1, logic.Select(c => $"not ({c})")),
            (1, Gen.Select(logic, comparison, (a, b) => $"({a}) and not {b}")),
            (1, value));
    }

    /// <summary>Relations over coefficients, mostly linear (some products, powers and calls, which must be refused).</summary>
    public static Gen<string> Relation()
    {
        var name = Gen.OneOf("b0", "b1", "b2", "t1", "`b 3`");
        var number = Gen.OneOf("0", "1", "2", "0.5", "1e-3", "1e308", "3", "-4", "1e-320", "10");
        var term = Gen.Frequency(
            (5, Gen.Select(number, name, (c, n) => $"{c}*{n}")),
            (3, name),
            (2, Gen.Select(name, number, (n, c) => $"{n}/{c}")),
            (1, Gen.Select(number, name, (c, n) => $"-({c} - {n})")),
            (1, Gen.Select(name, name, (a, b) => $"{a}*{b}")),
            (1, Gen.Select(name, number, (n, c) => $"{n}^{c}")),
            (1, name.Select(n => $"abs({n})")),
            (1, number));
        var side = Gen.Select(term.Array[1, 4], Gen.OneOf(" + ", " - "), (terms, op) => string.Join(op, terms));
        return Gen.Select(side, Gen.Frequency((6, Gen.OneOf("<=", ">=", "==")), (1, Gen.OneOf("<", ">", "!="))), side, (a, op, b) => $"{a} {op} {b}");
    }

    /// <summary>Nesting and chain lengths from a few levels to 100,000: parentheses, signs, powers, calls, logic.</summary>
    public static Gen<string> Deep() =>
        Gen.Select(Gen.Int[0, 15], Gen.Int[0, 1 << 16], (kind, argument) => DeepText(kind, Depthful(argument)));

    /// <summary>Arithmetic at the edges: zero divisors, overflow, underflow, domain errors.</summary>
    public static Gen<string> EdgeArithmetic() => Gen.OneOf(
        "x/0", "0/0", "1/(x-x)", "log(0)", "log(-1)", "sqrt(-1)", "exp(1000)", "exp(-1000)", "(-8)^(1/3)", "0^-1",
        "0^0", "2^1024", "x^0.5", "1e308*10", "1e308+1e308", "-1e308-1e308", "1e-308/1e308", "x^-2", "abs(-0)",
        "min(0/0, 1)", "max(1, 0/0)", "x^1e308", "(-x)^2.5", "exp(exp(exp(x)))", "log(exp(710))", "x*0/0",
        "1/x > 0", "x/0 > 1 or x < 0/0", "not 0/0 == 0/0", "b1 / 0 <= 1", "b1 * 1e308 * 10 <= 1", "b1 - b1 >= 0",
        "2^2^2^2^2", "2^-1^2", "-x^2", "--x", "+-+-x", "x----1", "1e308^2", "10^308*10", "x/1e-320");

    private static int Depthful(int argument) => Bytes.Depth(argument);

    private static string DeepText(int kind, int depth)
    {
        string Repeat(string piece) => string.Concat(Enumerable.Repeat(piece, depth));
        return kind switch
        {
            0 => Repeat("(") + "x" + Repeat(")"),
            1 => Repeat("("),
            2 => Repeat("-") + "x",
            3 => Repeat("not ") + "x > 0",
            4 => Repeat("x^") + "2",
            5 => "2" + Repeat("^-") + "1",
            6 => Repeat("abs(") + "x" + Repeat(")"),
            7 => Repeat("(-") + "x" + Repeat(")"),
            8 => Repeat("x + ") + "1",
            9 => Repeat("x * ") + "1",
            10 => Repeat("x < ") + "1",
            11 => Repeat("min(x, ") + "1" + Repeat(")"),
            12 => Repeat("x > 0 and ") + "y > 0",
            13 => Repeat("1+(") + "1" + Repeat(")"),
            14 => Repeat("(") + "x" + Repeat("+1)"),
            _ => Repeat(")"),
        };
    }
}
