using System.Diagnostics;
using System.Globalization;
using FitSpec.Diagnostics;
using FitSpec.Spec;
using Microsoft.Data.Sqlite;
using SQLitePCL;

namespace FitSpec.Data;

/// <summary>Where an SQLite source is: the database file (full and as errors name it) and the spec's keys.</summary>
internal sealed record SqliteSource(string FullPath, string ErrorPath, SpecText Database, SpecText Query);

/// <summary>
/// Runs a data query on an SQLite database opened read-only and reads the requested result columns into
/// double arrays. Only one statement that SQLite itself marks as read-only, starting with SELECT, WITH or
/// VALUES, is run, and it is stopped after a time limit. INTEGER and REAL values become doubles; NULL and
/// values that are not finite are "missing" (flagged with <c>drop</c>, otherwise errors naming the result
/// row and column); TEXT and BLOB values in a used column are always errors. Result rows are numbered
/// from 1; that number stands where a CSV has its line.
/// </summary>
internal static class SqliteQueryReader
{
    private const int MaxErrors = 20;

    // SQLite calls the progress handler every this many virtual-machine steps: often enough to stop a
    // runaway query within milliseconds of its time limit, rarely enough to cost nothing measurable.
    private const int ProgressSteps = 10_000;

    public static RawColumns Read(SqliteSource source, Func<IReadOnlyList<string>, IReadOnlyList<string>> selectColumns, bool dropMissing, int maxRows, TimeSpan timeout)
    {
        ArgumentNullException.ThrowIfNull(source);
        var keyword = SqlQueryText.FirstKeyword(source.Query.Value);
        if (!SqlQueryText.StartsLikeRead(source.Query.Value))
        {
            var what = keyword.Length == 0 ? "it holds no statement" : $"it starts with {keyword}";
            throw AtQuery(source, $"the query must be one SELECT statement ({what}); the data is only read, never changed");
        }

        using var connection = OpenReadOnly(source.FullPath, timeout);
        try
        {
            connection.Open();
        }
        catch (SqliteException e)
        {
            throw AtDatabase(source, $"cannot open the SQLite database: {Clean(e)}");
        }

        var db = connection.Handle!;

        // A database locked by a writer is waited for up to the same limit, then reported.
        raw.sqlite3_busy_timeout(db, (int)Math.Min(int.MaxValue, timeout.TotalMilliseconds));
        var clock = Stopwatch.StartNew();
        delegate_progress stopWhenLate = _ => clock.Elapsed > timeout ? 1 : 0;
        raw.sqlite3_progress_handler(db, ProgressSteps, stopWhenLate, null);
        try
        {
            var statement = Prepare(source, db);
            try
            {
                return ReadRows(source, db, statement, selectColumns, dropMissing, maxRows, timeout);
            }
            finally
            {
                raw.sqlite3_finalize(statement);
            }
        }
        finally
        {
            raw.sqlite3_progress_handler(db, 0, null, null);
            GC.KeepAlive(stopWhenLate);
        }
    }

    /// <summary>A connection that cannot write: SQLite refuses every change through it (SQLITE_READONLY).</summary>
    internal static SqliteConnection OpenReadOnly(string fullPath, TimeSpan timeout) => new(new SqliteConnectionStringBuilder
    {
        DataSource = fullPath,
        Mode = SqliteOpenMode.ReadOnly,
        Pooling = false,
        DefaultTimeout = (int)Math.Ceiling(timeout.TotalSeconds),
    }.ToString());

    private static sqlite3_stmt Prepare(SqliteSource source, sqlite3 db)
    {
        if (raw.sqlite3_prepare_v2(db, source.Query.Value, out var statement, out var tail) != raw.SQLITE_OK)
        {
            var message = raw.sqlite3_errmsg(db).utf8_to_string();
            var code = raw.sqlite3_extended_errcode(db);
            statement?.Dispose();
            throw Failed(source, code, message);
        }

        if (statement is null || statement.IsInvalid)
        {
            throw AtQuery(source, "the query holds no statement; give one SELECT statement");
        }

        try
        {
            if (HasAnotherStatement(db, tail))
            {
                throw AtQuery(source, "the query holds more than one statement; give one SELECT statement (a ';' ends it)");
            }

            if (raw.sqlite3_stmt_readonly(statement) == 0)
            {
                throw AtQuery(source, "the query would change the database; only a SELECT that reads is run");
            }

            if (raw.sqlite3_column_count(statement) == 0)
            {
                throw AtQuery(source, "the query returns no columns; give a SELECT that returns the model's columns");
            }
        }
        catch (FitSpecException)
        {
            raw.sqlite3_finalize(statement);
            throw;
        }

        return statement;
    }

    // What follows the first statement may be white space, comments or empty statements (';'), nothing else.
    private static bool HasAnotherStatement(sqlite3 db, string? tail)
    {
        while (!string.IsNullOrWhiteSpace(tail))
        {
            var rc = raw.sqlite3_prepare_v2(db, tail, out var next, out var rest);
            var found = next is not null && !next.IsInvalid;
            if (found)
            {
                raw.sqlite3_finalize(next);
            }

            if (rc != raw.SQLITE_OK || found)
            {
                return true;
            }

            if (rest == tail)
            {
                return false;
            }

            tail = rest;
        }

        return false;
    }

    private static RawColumns ReadRows(SqliteSource source, sqlite3 db, sqlite3_stmt statement, Func<IReadOnlyList<string>, IReadOnlyList<string>> selectColumns, bool dropMissing, int maxRows, TimeSpan timeout)
    {
        var header = Enumerable.Range(0, raw.sqlite3_column_count(statement))
            .Select(i => raw.sqlite3_column_name(statement, i).utf8_to_string() ?? "")
            .ToArray();
        var repeated = header.GroupBy(h => h, StringComparer.Ordinal).FirstOrDefault(g => g.Count() > 1);
        if (repeated is not null)
        {
            throw AtQuery(source, $"the query returns more than one column named '{repeated.Key}'; give each its own name with AS");
        }

        var names = selectColumns(header).Distinct(StringComparer.Ordinal).ToArray();
        var indices = new int[names.Length];
        for (var k = 0; k < names.Length; k++)
        {
            indices[k] = Array.IndexOf(header, names[k]);
            if (indices[k] < 0)
            {
                var hint = NameSuggester.Hint(names[k], header);
                throw AtQuery(source, $"the query returns no column '{names[k]}'{hint}; its columns are: {string.Join(", ", header)}; add it to the SELECT list");
            }
        }

        var capacity = 1024;
        var buffers = names.Select(_ => new double[capacity]).ToArray();
        var missing = new bool[capacity];
        var count = 0;
        var missingCount = 0;
        var errors = new List<Diagnostic>();
        while (errors.Count < MaxErrors)
        {
            var rc = raw.sqlite3_step(statement);
            if (rc == raw.SQLITE_DONE)
            {
                break;
            }

            if (rc != raw.SQLITE_ROW)
            {
                var code = raw.sqlite3_extended_errcode(db);
                throw code == raw.SQLITE_INTERRUPT
                    ? AtQuery(source, $"the query ran longer than {timeout.TotalSeconds.ToString(CultureInfo.InvariantCulture)} s and was stopped; make it cheaper (an index, fewer rows) or export the data to a file")
                    : Failed(source, code, raw.sqlite3_errmsg(db).utf8_to_string());
            }

            if (count >= maxRows)
            {
                throw AtQuery(source, $"the query returns more than {maxRows} rows; this is the limit for one fit");
            }

            if (count == capacity)
            {
                capacity *= 2;
                for (var k = 0; k < names.Length; k++)
                {
                    Array.Resize(ref buffers[k], capacity);
                }

                Array.Resize(ref missing, capacity);
            }

            var row = count + 1;
            var rowMissing = false;
            for (var k = 0; k < names.Length; k++)
            {
                var column = indices[k];
                var type = raw.sqlite3_column_type(statement, column);
                var value = type is raw.SQLITE_INTEGER or raw.SQLITE_FLOAT ? raw.sqlite3_column_double(statement, column) : double.NaN;
                buffers[k][count] = value;
                if (double.IsFinite(value))
                {
                    continue;
                }

                if (type is raw.SQLITE_TEXT or raw.SQLITE_BLOB)
                {
                    var shown = type == raw.SQLITE_TEXT ? $"text value '{Short(raw.sqlite3_column_text(statement, column).utf8_to_string())}'" : "a binary (BLOB) value";
                    errors.Add(new Diagnostic(source.ErrorPath, row, null, names[k], $"query row {row}: {shown}, not a number; CAST it in the query (CAST({names[k]} AS REAL)) or select a numeric column"));
                    continue;
                }

                rowMissing = true;
                if (!dropMissing && errors.Count < MaxErrors)
                {
                    var what = type == raw.SQLITE_NULL ? "missing value (NULL)" : $"value {value.ToString(CultureInfo.InvariantCulture)} is not a finite number";
                    errors.Add(new Diagnostic(source.ErrorPath, row, null, names[k], $"query row {row}: {what}; fill it in, leave the row out in the query, or set 'data.missing: drop'"));
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

        Array.Resize(ref missing, count);
        return new RawColumns(header, columns, Enumerable.Range(1, count).ToArray(), missing, missingCount);
    }

    // A damaged file or one that is not a database is the 'sqlite' key's fault; anything else the query's.
    private static FitSpecException Failed(SqliteSource source, int extendedCode, string? message)
    {
        var primary = extendedCode & 0xff;
        var text = $"SQLite: {message ?? "unknown error"}";
        return primary is raw.SQLITE_CORRUPT or raw.SQLITE_NOTADB or raw.SQLITE_CANTOPEN or raw.SQLITE_IOERR
            ? AtDatabase(source, $"cannot read the SQLite database ({text}); is it a complete, undamaged SQLite file?")
            : AtQuery(source, $"the query failed: {text}");
    }

    private static FitSpecException AtQuery(SqliteSource source, string message) =>
        new(new Diagnostic(source.Query.Pos.File, source.Query.Pos.Line, source.Query.Pos.Column, "data.query", message));

    private static FitSpecException AtDatabase(SqliteSource source, string message) =>
        new(new Diagnostic(source.Database.Pos.File, source.Database.Pos.Line, source.Database.Pos.Column, "data.sqlite", message));

    private static string Clean(SqliteException e) => e.Message.ReplaceLineEndings(" ");

    private static string Short(string? text)
    {
        text ??= "";
        return text.Length > 40 ? text[..40] + "…" : text;
    }
}
