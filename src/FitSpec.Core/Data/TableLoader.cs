using System.Security.Cryptography;
using FitSpec.Diagnostics;
using FitSpec.Expressions;
using FitSpec.Spec;

namespace FitSpec.Data;

/// <summary>What the data stage must read: the columns the model uses (given the header) and the row filter.</summary>
public sealed record DataRequest(Func<IReadOnlyList<string>, IReadOnlyList<string>> SelectColumns, Expr? Filter);

/// <summary>Stage 2: spec's data section → <see cref="Table"/> of the rows used, with the file's SHA-256.</summary>
public static class TableLoader
{
    /// <summary>Rows a single fit may read (clear error instead of running out of memory).</summary>
    public const int MaxRows = 50_000_000;

    public static Table Load(FitSpecDocument spec, DataRequest request)
    {
        ArgumentNullException.ThrowIfNull(spec);
        ArgumentNullException.ThrowIfNull(request);
        var data = spec.Data;
        if (data.Path is not { } pathText)
        {
            var at = data.Sqlite?.Pos ?? data.Pos;
            throw new FitSpecException(new Diagnostic(at.File, at.Line, at.Column, "data.sqlite", "data source 'sqlite' is not supported yet; export the query to a .csv file and use 'path:'"));
        }

        var full = Path.GetFullPath(Path.Combine(spec.Folder, pathText.Value));
        if (!File.Exists(full))
        {
            throw new FitSpecException(new Diagnostic(pathText.Pos.File, pathText.Pos.Line, pathText.Pos.Column, "data.path", $"data file '{pathText.Value}' not found (looked for {full})"));
        }

        var display = pathText.Value;
        var errorPath = Path.Combine(Path.GetDirectoryName(spec.File) ?? "", pathText.Value);
        var sha = HashFile(full);
        var separator = full.EndsWith(".tsv", StringComparison.OrdinalIgnoreCase) ? '\t' : ',';
        RawColumns raw;
        try
        {
            raw = CsvColumnReader.Read(full, errorPath, separator, request.SelectColumns, data.Missing == MissingPolicy.Drop, MaxRows);
        }
        catch (ArgumentException) when (DuplicateHeaderName(full, separator) is { } duplicate)
        {
            throw new FitSpecException(new Diagnostic(errorPath, 1, null, duplicate, "this column name appears more than once in the header; give each column its own name"));
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or InvalidDataException or FormatException or ArgumentException)
        {
            throw new FitSpecException(new Diagnostic(errorPath, null, null, null, $"cannot read data file: {e.Message.ReplaceLineEndings(" ")}"));
        }

        return Select(raw, full, display, errorPath, sha, request.Filter, pathText);
    }

    private static Table Select(RawColumns raw, string full, string display, string errorPath, string sha, Expr? filter, SpecText pathText)
    {
        var n = raw.Lines.Length;
        var keep = new bool[n];
        for (var i = 0; i < n; i++)
        {
            keep[i] = !raw.Missing[i];
        }

        var droppedFilter = 0;
        if (filter is not null)
        {
            var mask = ExpressionEvaluator.Evaluate(filter, name => raw.Columns[name], n);
            for (var i = 0; i < n; i++)
            {
                if (keep[i] && mask[i] == 0)
                {
                    keep[i] = false;
                    droppedFilter++;
                }
            }
        }

        var used = keep.Count(k => k);
        if (used == 0)
        {
            var why = n == 0 ? "the data file has no rows" : $"no rows left: {raw.MissingCount} dropped as missing, {droppedFilter} removed by the filter";
            throw new FitSpecException(new Diagnostic(pathText.Pos.File, pathText.Pos.Line, pathText.Pos.Column, "data", why));
        }

        var columns = new Dictionary<string, double[]>(StringComparer.Ordinal);
        foreach (var (name, values) in raw.Columns)
        {
            columns[name] = used == n ? values : Compact(values, keep, used);
        }

        var lines = used == n ? raw.Lines : Compact(raw.Lines, keep, used);
        return new Table(full, display, errorPath, sha, raw.Header, columns, lines, n, raw.MissingCount, droppedFilter);
    }

    private static T[] Compact<T>(T[] values, bool[] keep, int count)
    {
        var result = new T[count];
        var j = 0;
        for (var i = 0; i < values.Length; i++)
        {
            if (keep[i])
            {
                result[j++] = values[i];
            }
        }

        return result;
    }

    // The CSV package refuses a header that repeats a name, without saying which line; find the name.
    private static string? DuplicateHeaderName(string path, char separator)
    {
        using var reader = new StreamReader(path);
        var header = reader.ReadLine() ?? "";
        var seen = new HashSet<string>(StringComparer.Ordinal);
        foreach (var raw in header.Split(separator))
        {
            var name = raw.Trim().Trim('"');
            if (!seen.Add(name))
            {
                return name;
            }
        }

        return null;
    }

    public static string HashFile(string path)
    {
        using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 20);
        return Convert.ToHexStringLower(SHA256.HashData(stream));
    }
}
