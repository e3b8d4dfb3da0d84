using System.Text;

namespace FitSpec.Fuzz.Mutation;

/// <summary>
/// What a hostile or careless spec file may contain: YAML tags (including ones that ask other loaders to
/// build objects), anchors and aliases, flow brackets, odd Unicode, odd numbers, directives and document
/// markers, and keys with extreme values; plus transforms for deep nesting, alias bombs, line ends, BOMs
/// and tab indentation.
/// </summary>
public static class YamlMutations
{
    // Declared before the lists built from it: static fields initialise in written order.
    private static readonly string[] Numbers =
    [
        "1e309", "-1e309", "1e-400", "4.9e-324", "1.7976931348623157e308", "99999999999999999999", "2147483648",
        "-2147483649", "0x10", "0o17", "1_000", ".inf", "-.inf", ".nan", "NaN", "-0", "+1", "1e", "00001", "0",
        "-1", "1000000", "2147483647", "1e6", "1e9", "0.5", "1.0e-4", "-1e-9", "1e100",
    ];

    public static IReadOnlyList<byte[]> Snippets { get; } = BuildSnippets();

    public static IReadOnlyList<Transform> Transforms { get; } =
    [
        DeepFlowSequence,
        DeepFlowMapping,
        DeepBlockSequence,
        DeepIndentation,
        AliasBomb,
        LineEnds,
        ByteOrderMark,
        TabIndent,
        ReplaceNumber,
        SecondDocument,
        MergeKey,
        AnchorAndAlias,
    ];

    private static List<byte[]> BuildSnippets()
    {
        var text = new List<string>
        {
            "!!python/object:os.system ", "!!python/object/apply:subprocess.check_output ['ls'] ", "!custom ",
            "!!binary ", "!!str ", "!!int ", "!!float ", "!!map ", "!!seq ", "!<tag:yaml.org,2002:str> ", "! ",
            "!!set ", "!!timestamp ", "!e!tag ", "&a ", "*a", "*undefined", "<<: *a\n", "&a [x, *a]", "&a {k: *a}",
            "{", "}", "[", "]", "'", "\"", "\\", "\t", "\uFEFF", "\r", "\r\n", "\n", "\0", "\u202E", "\u0301",
            "\U0001F600", "\uFFFF", "\u01C5", "\u0130", "\u00DF", "\u2028", "\u0085", "\u00A0", "\u200B",
            "---\n", "...\n", "%YAML 1.2\n", "%YAML 9.9\n", "%TAG ! tag:example.com,2000:\n", "? ", "- ", "~",
            "null", "yes", "no", "on", "off", "y", "true", ": ", " #", "|\n  ", ">-\n  ", "|+\n", "\"\\u0000\"",
            "\"\\x41\"", "\"\\uD800\"", "'it''s'", ", ", ": :", "::", "- - -", "{a: 1, a: 2}", "[1, [2, [3]]]",
            "fitspec: 2\n", "name: Bad Name\n", "name: \"\"\n", "loss: {kind: huber}\n", "loss: {kind: quantile, tau: 1}\n",
            "solve: {time-limit: 1e308}\n", "solve: {method: qr}\n", "penalties: [{kind: count, max: 2147483647}]\n",
            "penalties: [{kind: smoothness, order: 99, weight: 1}]\n", "report: {uncertainty: {bootstrap: 2147483647, seed: 1}}\n",
            "knots: 100000", "degree: 1000", "grid: 100000000", "bootstrap: 100000", "max-abs: -1", "weight: 1e308",
            "over: [1e308, -1e308]", "at: [1, 1, 1]", "at: {}", "on: []", "on: [\"*\"]", "columns: \"*\"", "columns: \"\"",
            "filter: \"x > 0 and\"", "weight: \"0\"", "response: \"1\"", "path: /dev/zero.csv", "path: ../../x.csv",
            "path: data/", "missing: drop\n", "b9: log(0)\n", "b9: 1/0\n", "b9: x^1e308\n", "b9: exp(exp(exp(9)))\n",
            "- \"b1 >= 1e308\"\n", "- \"b1 <= -1e308\"\n", "- \"b0 == 1\"\n- \"b0 == 2\"\n", "- {kind: value, at: {}, equals: 0}\n",
            "- {kind: increasing, in: \"\", over: [0, 1]}\n", "- {kind: bounds, min: 1, max: 0}\n",
        };
        text.AddRange(Numbers);
        var bytes = text.Select(Encoding.UTF8.GetBytes).ToList();

        // Bytes that are not UTF-8: a lone surrogate, an overlong NUL, a stray continuation byte.
        bytes.Add([0xED, 0xA0, 0x80]);
        bytes.Add([0xC0, 0x80]);
        bytes.Add([0x80]);
        bytes.Add([0xFF, 0xFE]);
        return bytes;
    }

    // Insert after the next ': ' (where a value starts), else at the position itself.
    private static int ValueStart(byte[] data, int position)
    {
        var at = data.Length == 0 ? 0 : position % data.Length;
        var after = Bytes.After(data, at, ": "u8);
        return after < 0 ? at : after;
    }

    private static byte[] DeepFlowSequence(byte[] data, int position, int argument)
    {
        var depth = Bytes.Depth(argument);
        return Bytes.Splice(data, ValueStart(data, position), 0, [.. Bytes.Repeat("[", depth), .. "1"u8, .. Bytes.Repeat("]", depth)]);
    }

    private static byte[] DeepFlowMapping(byte[] data, int position, int argument)
    {
        var depth = Bytes.Depth(argument);
        return Bytes.Splice(data, ValueStart(data, position), 0, [.. Bytes.Repeat("{a: ", depth), .. "1"u8, .. Bytes.Repeat("}", depth)]);
    }

    private static byte[] DeepBlockSequence(byte[] data, int position, int argument)
    {
        var line = Bytes.LineAt(data, data.Length == 0 ? 0 : position % data.Length);
        return Bytes.Splice(data, line.Start, 0, [.. "k: "u8, .. Bytes.Repeat("- ", Bytes.Depth(argument)), .. "x\n"u8]);
    }

    private static byte[] DeepIndentation(byte[] data, int position, int argument)
    {
        // Each level indents one more space, so the text grows with depth squared: kept to 1500 levels.
        var depth = Math.Min(Bytes.Depth(argument), 1500);
        var builder = new StringBuilder();
        for (var i = 0; i < depth; i++)
        {
            builder.Append(' ', i).Append("k:\n");
        }

        builder.Append(' ', depth).Append("1\n");
        var line = Bytes.LineAt(data, data.Length == 0 ? 0 : position % data.Length);
        return Bytes.Splice(data, line.Start, 0, Encoding.UTF8.GetBytes(builder.ToString()));
    }

    /// <summary>
    /// Anchors that each repeat the previous one several times ("billion laughs"), placed first, with the last
    /// referenced as a value, as a list item or as a mapping key further down.
    /// </summary>
    private static byte[] AliasBomb(byte[] data, int position, int argument)
    {
        var levels = 2 + (argument % 9);
        var fan = 2 + (argument / 9 % 9);
        var builder = new StringBuilder("b0: &b0 [");
        builder.AppendJoin(", ", Enumerable.Repeat("lol", fan)).Append("]\n");
        for (var level = 1; level < levels; level++)
        {
            builder.Append($"b{level}: &b{level} [").AppendJoin(", ", Enumerable.Repeat($"*b{level - 1}", fan)).Append("]\n");
        }

        var top = $"*b{levels - 1}";
        var bomb = Encoding.UTF8.GetBytes(builder.ToString());
        var withBomb = Bytes.Splice(data, 0, 0, bomb);
        var use = (argument / 81 % 3) switch
        {
            0 => Encoding.UTF8.GetBytes(top),
            1 => Encoding.UTF8.GetBytes($"[{top}, {top}]"),
            _ => Encoding.UTF8.GetBytes($"{{? {top} : 1, ? [{top}] : 2}}"),
        };
        return Bytes.Splice(withBomb, ValueStart(withBomb, bomb.Length + position), 0, use);
    }

    private static byte[] LineEnds(byte[] data, int position, int argument)
    {
        var text = Encoding.UTF8.GetString(data);
        return Encoding.UTF8.GetBytes((argument % 3) switch
        {
            0 => text.Replace("\n", "\r\n", StringComparison.Ordinal),
            1 => text.Replace("\n", "\r", StringComparison.Ordinal),
            _ => text.Replace("\n", "\u0085", StringComparison.Ordinal),
        });
    }

    private static byte[] ByteOrderMark(byte[] data, int position, int argument) => (argument % 4) switch
    {
        0 => [0xEF, 0xBB, 0xBF, .. data],
        1 => [0xEF, 0xBB, 0xBF, 0xEF, 0xBB, 0xBF, .. data],
        2 => [0xFF, 0xFE, .. Encoding.Unicode.GetBytes(Encoding.UTF8.GetString(data))],
        _ => Bytes.Splice(data, data.Length == 0 ? 0 : position % data.Length, 0, [0xEF, 0xBB, 0xBF]),
    };

    private static byte[] TabIndent(byte[] data, int position, int argument)
    {
        if (data.Length == 0)
        {
            return data;
        }

        var line = Bytes.LineAt(data, position % data.Length);
        var spaces = 0;
        while (line.Start + spaces < line.End && data[line.Start + spaces] == ' ')
        {
            spaces++;
        }

        // A tab in place of the indentation, or after it (where YAML allows it as separation).
        return argument % 2 == 0 ? Bytes.Splice(data, line.Start, spaces, "\t"u8) : Bytes.Splice(data, line.Start + spaces, 0, "\t"u8);
    }

    private static byte[] ReplaceNumber(byte[] data, int position, int argument)
    {
        var at = data.Length == 0 ? 0 : position % data.Length;
        for (var i = at; i < data.Length; i++)
        {
            if (char.IsAsciiDigit((char)data[i]))
            {
                var (start, end) = Bytes.TokenAt(data, i);
                return Bytes.Splice(data, start, end - start, Encoding.UTF8.GetBytes(Numbers[argument % Numbers.Length]));
            }
        }

        return data;
    }

    private static byte[] SecondDocument(byte[] data, int position, int argument) =>
        argument % 2 == 0 ? [.. data, .. "\n---\n"u8, .. data] : [.. "---\n"u8, .. data, .. "\n...\n"u8];

    private static byte[] MergeKey(byte[] data, int position, int argument)
    {
        var line = Bytes.LineAt(data, data.Length == 0 ? 0 : position % data.Length);
        return Bytes.Splice(data, line.Start, 0, argument % 2 == 0 ? "m: &m {fitspec: 1}\n<<: *m\n"u8 : "<<: [*m, *n]\n"u8);
    }

    // An anchor on one value and an alias to it somewhere later: a shared node read in two places.
    private static byte[] AnchorAndAlias(byte[] data, int position, int argument)
    {
        var first = ValueStart(data, position);
        var anchored = Bytes.Splice(data, first, 0, "&x "u8);
        var second = ValueStart(anchored, first + 3 + (argument % 4096));
        if (second <= first + 3)
        {
            return anchored;
        }

        // The alias replaces the value that started there, up to the end of its line.
        var line = Bytes.LineAt(anchored, Math.Min(second, anchored.Length - 1));
        var valueEnd = Math.Max(second, line.End - 1);
        return Bytes.Splice(anchored, second, valueEnd - second, "*x"u8);
    }
}
