using System.Globalization;
using FitSpec.Diagnostics;
using nietras.SeparatedValues;

namespace FitSpec.Data;

/// <summary>What the reader returns: the header, the requested columns and a per-row "missing" flag.</summary>
internal sealed record RawColumns(
    IReadOnlyList<string> Header,
    Dictionary<string, double[]> Columns,
    int[] Lines,
    bool[] Missing,
    int MissingCount);

/// <summary>
/// Reads the requested columns of a CSV/TSV file into double arrays in one pass. A cell that is empty, not a
/// number or not finite is "missing": with <c>drop</c> its row is flagged, otherwise it is an error naming the
/// file line and the column.
/// </summary>
internal static class CsvColumnReader
{
    public static RawColumns Read(string path, string displayPath, char separator, Func<IReadOnlyList<string>, IReadOnlyList<string>> selectColumns, bool dropMissing, int maxRows)
    {
        // Without a header there is nothing to name: say so, rather than that every column is missing.
        if (new FileInfo(path).Length == 0)
        {
            throw new FitSpecException(new Diagnostic(displayPath, null, null, null, "the data file is empty (0 bytes); it needs a header line naming its columns, then one line per row"));
        }

        using var reader = Sep.Reader(o => o with { Sep = new Sep(separator), Unescape = true, DisableColCountCheck = true })
            .FromFile(path);
        var header = reader.Header.ColNames.ToArray();
        if (header.Length <= 1 && header.All(string.IsNullOrWhiteSpace))
        {
            throw new FitSpecException(new Diagnostic(displayPath, 1, null, null, "the data file is empty: its first line, the header naming the columns, is blank"));
        }

        var names = selectColumns(header).Distinct(StringComparer.Ordinal).ToArray();
        var indices = new int[names.Length];
        for (var k = 0; k < names.Length; k++)
        {
            var idx = Array.IndexOf(header, names[k]);
            if (idx < 0)
            {
                var hint = NameSuggester.Hint(names[k], header);
                throw new FitSpecException(new Diagnostic(displayPath, 1, null, names[k], $"no column '{names[k]}' in the header{hint}; columns are: {string.Join(", ", header)}"));
            }

            indices[k] = idx;
        }

        var buffers = new double[names.Length][];
        var capacity = 1024;
        for (var k = 0; k < names.Length; k++)
        {
            buffers[k] = new double[capacity];
        }

        var lines = new int[capacity];
        var missing = new bool[capacity];
        var count = 0;
        var missingCount = 0;
        var errors = new List<Diagnostic>();
        foreach (var row in reader)
        {
            if (count == capacity)
            {
                capacity *= 2;
                for (var k = 0; k < names.Length; k++)
                {
                    Array.Resize(ref buffers[k], capacity);
                }

                Array.Resize(ref lines, capacity);
                Array.Resize(ref missing, capacity);
            }

            if (count >= maxRows)
            {
                throw new FitSpecException(new Diagnostic(displayPath, row.LineNumberFrom, null, null, $"more than {maxRows} data rows; this is the limit for one fit"));
            }

            var line = row.LineNumberFrom;
            if (row.ColCount != header.Length)
            {
                throw new FitSpecException(new Diagnostic(displayPath, line, null, null, $"this row has {row.ColCount} fields but the header has {header.Length}; check for a stray or missing separator"));
            }

            lines[count] = line;
            var rowMissing = false;
            for (var k = 0; k < names.Length; k++)
            {
                var span = row[indices[k]].Span.Trim(' ');
                if (TryParseNumber(span, out var v))
                {
                    buffers[k][count] = v;
                    continue;
                }

                buffers[k][count] = double.NaN;
                rowMissing = true;
                if (!dropMissing && errors.Count < 20)
                {
                    errors.Add(new Diagnostic(displayPath, line, null, names[k], Describe(span)));
                }
            }

            if (rowMissing)
            {
                missing[count] = true;
                missingCount++;
            }

            count++;
        }

        if (errors.Count > 0)
        {
            throw new FitSpecException(errors);
        }

        var columns = new Dictionary<string, double[]>(StringComparer.Ordinal);
        for (var k = 0; k < names.Length; k++)
        {
            Array.Resize(ref buffers[k], count);
            columns[names[k]] = buffers[k];
        }

        Array.Resize(ref lines, count);
        Array.Resize(ref missing, count);
        return new RawColumns(header, columns, lines, missing, missingCount);
    }

    // A fast float parser (as fast as the CSV scan itself, measured in bench/CsvReaderBench) that must consume
    // the whole cell: "1,5" or "1.5x" are not numbers, and neither are NaN or infinities.
    private static bool TryParseNumber(ReadOnlySpan<char> cell, out double value) =>
        csFastFloat.FastDoubleParser.TryParseDouble(cell, out var consumed, out value, NumberStyles.Float, '.')
        && consumed == cell.Length
        && cell.Length > 0
        && double.IsFinite(value);

    private static string Describe(ReadOnlySpan<char> cell)
    {
        var text = cell.Trim().ToString();
        if (text.Length == 0)
        {
            return "missing value (empty cell); fill it in or set 'data.missing: drop'";
        }

        if ((double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) && !double.IsFinite(v)) || IsInfinityWord(text))
        {
            return $"value '{text}' is not a finite number; fix it or set 'data.missing: drop'";
        }

        if (text.Length > 40)
        {
            text = text[..40] + "…";
        }

        return $"non-numeric value '{text}'; fix it or set 'data.missing: drop'";
    }

    // The short spellings of infinity that exporters write ("inf", "-inf", "+Inf"), which the parser does not know.
    private static bool IsInfinityWord(string text) =>
        text.TrimStart('+', '-').Equals("inf", StringComparison.OrdinalIgnoreCase);
}
