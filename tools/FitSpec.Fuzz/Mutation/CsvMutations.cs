using System.Text;

namespace FitSpec.Fuzz.Mutation;

/// <summary>
/// What a data file may hold that a careful reader must refuse or read right: odd numbers (NaN, infinities,
/// 1e308 and beyond, other digits), ragged rows, quotes, huge fields, BOMs, CR-only or mixed line ends,
/// repeated or empty header names, many columns, many rows.
/// </summary>
public static class CsvMutations
{
    // Declared before the lists built from it: static fields initialise in written order.
    private static readonly string[] Values =
    [
        "NaN", "nan", "Inf", "-Infinity", "\u221E", "1e308", "1.7976931348623157e308", "1e309", "-1e309", "4.9e-324",
        "1e-400", "", "  ", " 1 ", "\"1,5\"", "0x1F", "1_000", "\u0661\u0662\u0663", "\u0661.\u0665", "+1", "-0", ".5", "5.",
        "1e", "e5", "--1", "1.2.3", "\"1\"", "\"\"", "\"a\"\"b\"", "TRUE", "null", "#N/A", "-", "1 2", "1\u00A0", "\t1\t",
        "1" + new string('0', 400), "0." + new string('0', 400) + "1", "1e+308", "1E-5", "\u2212" + "1", "１", "1.0e0",
        "\"1\n2\"", "\"unclosed", "9" + new string('9', 20),
    ];

    public static IReadOnlyList<byte[]> Snippets { get; } = BuildSnippets();

    public static IReadOnlyList<Transform> Transforms { get; } =
    [
        ReplaceCell,
        RaggedRow,
        Quote,
        HugeField,
        LineEnds,
        ByteOrderMark,
        HeaderEdit,
        ManyColumns,
        ManyRows,
        SwapSeparator,
    ];

    private static List<byte[]> BuildSnippets()
    {
        var list = Values.Select(Encoding.UTF8.GetBytes).ToList();
        list.AddRange(new[] { ",", "\t", ";", "\"", "\r", "\n", "\r\n", "\uFEFF", "\0", ",,", "\"\"\"" }.Select(Encoding.UTF8.GetBytes));
        list.Add([0xFF]);
        list.Add([0xED, 0xA0, 0x80]);
        return list;
    }

    public static byte SeparatorOf(byte[] data)
    {
        ArgumentNullException.ThrowIfNull(data);
        var firstLine = Array.IndexOf(data, (byte)'\n') is var end and >= 0 ? data.AsSpan(0, end) : data;
        return firstLine.Contains((byte)'\t') ? (byte)'\t' : (byte)',';
    }

    /// <summary>The cell holding <paramref name="at"/>: from after the previous separator or line end to before the next.</summary>
    private static (int Start, int End) CellAt(byte[] data, int at, byte separator)
    {
        var start = at;
        while (start > 0 && data[start - 1] != separator && data[start - 1] != '\n' && data[start - 1] != '\r')
        {
            start--;
        }

        var end = at;
        while (end < data.Length && data[end] != separator && data[end] != '\n' && data[end] != '\r')
        {
            end++;
        }

        return (start, end);
    }

    private static int At(byte[] data, int position) => data.Length == 0 ? 0 : position % data.Length;

    private static byte[] ReplaceCell(byte[] data, int position, int argument)
    {
        var (start, end) = CellAt(data, At(data, position), SeparatorOf(data));
        return Bytes.Splice(data, start, end - start, Encoding.UTF8.GetBytes(Values[argument % Values.Length]));
    }

    private static byte[] RaggedRow(byte[] data, int position, int argument)
    {
        var separator = SeparatorOf(data);
        var line = Bytes.LineAt(data, At(data, position));
        switch (argument % 3)
        {
            case 0:
                {
                    var found = Array.IndexOf(data, separator, line.Start, line.End - line.Start);
                    return found < 0 ? data : Bytes.Splice(data, found, 1, []);
                }

            case 1:
                return Bytes.Splice(data, Math.Max(line.Start, line.End - 1), 0, [separator, (byte)'7']);
            default:
                {
                    var kept = data[line.Start..line.End].Where(b => b != separator).ToArray();
                    return Bytes.Splice(data, line.Start, line.End - line.Start, kept);
                }
        }
    }

    private static byte[] Quote(byte[] data, int position, int argument)
    {
        var (start, end) = CellAt(data, At(data, position), SeparatorOf(data));
        return (argument % 4) switch
        {
            0 => Bytes.Splice(Bytes.Splice(data, end, 0, "\""u8), start, 0, "\""u8),
            1 => Bytes.Splice(data, start, 0, "\""u8),
            2 => Bytes.Splice(data, start, end - start, [.. "\""u8, .. data[start..end], .. "\n\""u8]),
            _ => Bytes.Splice(data, start, end - start, [.. "\""u8, .. data[start..end], .. "\"x"u8]),
        };
    }

    private static byte[] HugeField(byte[] data, int position, int argument)
    {
        var (start, end) = CellAt(data, At(data, position), SeparatorOf(data));
        var length = 1000 * (1 + (argument % 1000));
        var filler = argument % 2 == 0 ? (byte)'9' : (byte)'x';
        var huge = new byte[length];
        Array.Fill(huge, filler);
        return Bytes.Splice(data, start, end - start, huge);
    }

    private static byte[] LineEnds(byte[] data, int position, int argument)
    {
        var text = Encoding.UTF8.GetString(data);
        return Encoding.UTF8.GetBytes((argument % 5) switch
        {
            0 => text.Replace("\n", "\r\n", StringComparison.Ordinal),
            1 => text.Replace("\n", "\r", StringComparison.Ordinal),
            2 => text.TrimEnd('\n'),
            3 => text.Replace("\n", "\n\n", StringComparison.Ordinal),
            _ => string.Concat(text.Split('\n').Select((line, i) => line + (i % 2 == 0 ? "\r\n" : "\r"))),
        });
    }

    private static byte[] ByteOrderMark(byte[] data, int position, int argument) => (argument % 3) switch
    {
        0 => [0xEF, 0xBB, 0xBF, .. data],
        1 => [0xFF, 0xFE, .. Encoding.Unicode.GetBytes(Encoding.UTF8.GetString(data))],
        _ => Bytes.Splice(data, At(data, position), 0, [0xEF, 0xBB, 0xBF]),
    };

    private static byte[] HeaderEdit(byte[] data, int position, int argument)
    {
        var separator = (char)SeparatorOf(data);
        var text = Encoding.UTF8.GetString(data);
        var newline = text.IndexOf('\n', StringComparison.Ordinal);
        var header = newline < 0 ? text : text[..newline];
        var rest = newline < 0 ? "" : text[newline..];
        var names = header.Split(separator);
        var i = names.Length == 0 ? 0 : position % names.Length;
        switch (argument % 6)
        {
            case 0:
                names[i] = names[(i + 1) % names.Length];
                break;
            case 1:
                names[i] = "";
                break;
            case 2:
                names[i] = $" {names[i]} ";
                break;
            case 3:
                names[i] = $"\"{names[i]}\"";
                break;
            case 4:
                return Encoding.UTF8.GetBytes(header);
            default:
                return Encoding.UTF8.GetBytes(rest.TrimStart('\n'));
        }

        return Encoding.UTF8.GetBytes(string.Join(separator, names) + rest);
    }

    private static byte[] ManyColumns(byte[] data, int position, int argument)
    {
        var separator = (char)SeparatorOf(data);
        var extra = 1 + (argument % 2000);
        var lines = Encoding.UTF8.GetString(data).Split('\n');
        var builder = new StringBuilder();
        for (var l = 0; l < lines.Length; l++)
        {
            builder.Append(lines[l]);
            if (lines[l].Length > 0)
            {
                for (var c = 0; c < extra; c++)
                {
                    builder.Append(separator).Append(l == 0 ? $"c{c}" : "1");
                }
            }

            if (l < lines.Length - 1)
            {
                builder.Append('\n');
            }
        }

        return Encoding.UTF8.GetBytes(builder.ToString());
    }

    private static byte[] ManyRows(byte[] data, int position, int argument)
    {
        var line = Bytes.LineAt(data, At(data, position));
        if (line.Start == 0 || line.End <= line.Start)
        {
            return data;
        }

        var row = data[line.Start..line.End];
        if (row[^1] != '\n')
        {
            row = [.. row, (byte)'\n'];
        }

        var times = (int)Math.Min(1 + (argument % 20_000), (4L << 20) / row.Length);
        var repeated = new byte[row.Length * times];
        for (var i = 0; i < times; i++)
        {
            row.CopyTo(repeated, i * row.Length);
        }

        return Bytes.Splice(data, line.End, 0, repeated);
    }

    private static byte[] SwapSeparator(byte[] data, int position, int argument)
    {
        var from = SeparatorOf(data);
        var to = (argument % 3) switch
        {
            0 => (byte)';',
            1 => from == ',' ? (byte)'\t' : (byte)',',
            _ => (byte)'|',
        };
        return data.Select(b => b == from ? to : b).ToArray();
    }
}
