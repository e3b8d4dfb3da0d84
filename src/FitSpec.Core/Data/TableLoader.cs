using FitSpec.Diagnostics;
using FitSpec.Expressions;
using FitSpec.Spec;

namespace FitSpec.Data;

/// <summary>What the data stage must read: the columns the model uses (given the header) and the row filter.</summary>
public sealed record DataRequest(Func<IReadOnlyList<string>, IReadOnlyList<string>> SelectColumns, Expr? Filter);

/// <summary>
/// Stage 2: spec's data section → <see cref="Table"/> of the rows used, with the data's SHA-256 (see
/// <see cref="DataDigest"/>). The source is a CSV/TSV or Parquet file (by its extension) or an SQLite query.
/// </summary>
public static class TableLoader
{
    /// <summary>Rows a single fit may read (clear error instead of running out of memory).</summary>
    public const int MaxRows = 50_000_000;

    /// <summary>Size of a data file (or database) one fit may read: 16 GiB, beyond what a fit's rows limit can use.</summary>
    public const long MaxFileBytes = 16L << 30;

    /// <summary>Seconds an SQLite data query may run (or wait for a locked database) before it is stopped.</summary>
    public const int QueryTimeoutSeconds = 30;

    public static Table Load(FitSpecDocument spec, DataRequest request) =>
        Load(spec, request, TimeSpan.FromSeconds(QueryTimeoutSeconds));

    internal static Table Load(FitSpecDocument spec, DataRequest request, TimeSpan queryTimeout)
    {
        ArgumentNullException.ThrowIfNull(spec);
        ArgumentNullException.ThrowIfNull(request);
        var data = spec.Data;
        if (data.Sqlite is { } database && data.Query is { } query)
        {
            return LoadQuery(spec, request, database, query, queryTimeout);
        }

        if (data.Path is not { } pathText)
        {
            // The spec reader refuses a data section without a source; this guards callers that build one.
            throw new FitSpecException(new Diagnostic(data.Pos.File, data.Pos.Line, data.Pos.Column, "data.path", "data needs 'path:' or 'sqlite:' with 'query:'"));
        }

        var full = Path.GetFullPath(Path.Combine(spec.Folder, pathText.Value));
        if (!File.Exists(full))
        {
            throw new FitSpecException(new Diagnostic(pathText.Pos.File, pathText.Pos.Line, pathText.Pos.Column, "data.path", $"data file '{pathText.Value}' not found (looked for {full})"));
        }

        CheckSize(full, pathText, "data.path");
        var display = pathText.Value;
        var errorPath = ErrorPath(spec, pathText);
        var sha = HashFile(full);
        var dropMissing = data.Missing == MissingPolicy.Drop;
        var parquet = full.EndsWith(".parquet", StringComparison.OrdinalIgnoreCase);
        var separator = full.EndsWith(".tsv", StringComparison.OrdinalIgnoreCase) ? '\t' : ',';
        RawColumns raw;
        try
        {
            raw = parquet
                ? ParquetColumnReader.Read(full, errorPath, request.SelectColumns, dropMissing, MaxRows)
                : CsvColumnReader.Read(full, errorPath, separator, request.SelectColumns, dropMissing, MaxRows);
        }
        catch (ArgumentException) when (!parquet && DuplicateHeaderName(full, separator) is { } duplicate)
        {
            throw new FitSpecException(new Diagnostic(errorPath, 1, null, duplicate, "this column name appears more than once in the header; give each column its own name"));
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or InvalidDataException or FormatException or ArgumentException)
        {
            throw new FitSpecException(new Diagnostic(errorPath, null, null, null, $"cannot read data file: {e.Message.ReplaceLineEndings(" ")}"));
        }

        return Select(raw, full, display, errorPath, sha, request.Filter, data.Filter, pathText, "the data file has no rows");
    }

    private static Table LoadQuery(FitSpecDocument spec, DataRequest request, SpecText database, SpecText query, TimeSpan timeout)
    {
        var full = Path.GetFullPath(Path.Combine(spec.Folder, database.Value));
        if (!File.Exists(full))
        {
            throw new FitSpecException(new Diagnostic(database.Pos.File, database.Pos.Line, database.Pos.Column, "data.sqlite", $"database file '{database.Value}' not found (looked for {full})"));
        }

        CheckSize(full, database, "data.sqlite");

        // Committed changes still in the write-ahead log are read by SQLite but are not in the file's bytes,
        // so the data's SHA-256 would not cover them.
        var wal = new FileInfo(full + "-wal");
        if (wal.Exists && wal.Length > 0)
        {
            throw new FitSpecException(new Diagnostic(database.Pos.File, database.Pos.Line, database.Pos.Column, "data.sqlite", $"the database has changes in '{wal.Name}' that are not yet in the database file, so its SHA-256 would not cover them; close the programs that use it, or run 'PRAGMA wal_checkpoint(TRUNCATE);' on it"));
        }

        var errorPath = ErrorPath(spec, database);
        RawColumns raw;
        string sha;
        try
        {
            sha = DataDigest.OfQuery(full, query.Value);
            raw = SqliteQueryReader.Read(new SqliteSource(full, errorPath, database, query), request.SelectColumns, spec.Data.Missing == MissingPolicy.Drop, MaxRows, timeout);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new FitSpecException(new Diagnostic(database.Pos.File, database.Pos.Line, database.Pos.Column, "data.sqlite", $"cannot read the database file: {e.Message.ReplaceLineEndings(" ")}"));
        }

        var display = $"{database.Value} (query: {SqlQueryText.OneLine(query.Value)})";
        return Select(raw, full, display, errorPath, sha, request.Filter, spec.Data.Filter, query, "the query returned no rows");
    }

    private static void CheckSize(string full, SpecText source, string field)
    {
        var length = new FileInfo(full).Length;
        if (length > MaxFileBytes)
        {
            throw new FitSpecException(new Diagnostic(source.Pos.File, source.Pos.Line, source.Pos.Column, field,
                $"'{source.Value}' is {length / (double)(1L << 30):F1} GiB, more than the {MaxFileBytes >> 30} GiB one fit may read; split the data or select rows before fitting"));
        }
    }

    // Errors name a data file by its path from the working folder (the spec's folder joined to the path as written).
    private static string ErrorPath(FitSpecDocument spec, SpecText file) => Path.Combine(Path.GetDirectoryName(spec.File) ?? "", file.Value);

    private static Table Select(RawColumns raw, string full, string display, string errorPath, string sha, Expr? filter, SpecText? filterText, SpecText source, string noRows)
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
            throw new FitSpecException(NoRowsLeft(n, raw.MissingCount, droppedFilter, source, filterText, noRows));
        }

        var columns = new Dictionary<string, double[]>(StringComparer.Ordinal);
        foreach (var (name, values) in raw.Columns)
        {
            columns[name] = used == n ? values : Compact(values, keep, used);
        }

        var lines = used == n ? raw.Lines : Compact(raw.Lines, keep, used);
        return new Table(full, display, errorPath, sha, raw.Header, columns, lines, n, raw.MissingCount, droppedFilter);
    }

    // When the filter removed the last rows it is the filter that must change, so the error points at it.
    private static Diagnostic NoRowsLeft(int read, int missing, int filtered, SpecText source, SpecText? filterText, string noRows)
    {
        if (read == 0)
        {
            return new Diagnostic(source.Pos.File, source.Pos.Line, source.Pos.Column, "data", noRows);
        }

        var why = $"no rows left: {missing} dropped as missing, {filtered} removed by the filter";
        return filtered > 0 && filterText is { } f
            ? new Diagnostic(f.Pos.File, f.Pos.Line, f.Pos.Column, "data.filter", $"{why} '{f.Value}'; loosen the filter or check the data it is meant to select")
            : new Diagnostic(source.Pos.File, source.Pos.Line, source.Pos.Column, "data", $"{why}; fill in the missing values or check the data source");
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

    /// <summary>SHA-256 of a data file's bytes (see <see cref="DataDigest.OfFile"/>).</summary>
    public static string HashFile(string path) => DataDigest.OfFile(path);
}
