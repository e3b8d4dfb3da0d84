using System.Diagnostics;
using FitSpec.Data;
using FitSpec.Spec;
using Microsoft.Data.Sqlite;
using static FitSpec.Tests.Data.DataFiles;

namespace FitSpec.Tests.Data;

public sealed class SqliteSourceTests : IDisposable
{
    private readonly Support.TempFolder _temp = new("fitspec-sqlite");

    private string In(string name) => Path.Combine(_temp.Path, name);

    [Theory]
    [InlineData("l2")]
    [InlineData("l1")]
    [InlineData("{kind: huber, width: 0.5}")]
    public void A_query_fits_like_the_same_rows_in_csv(string loss)
    {
        var (x, y) = Noise(45, seed: 7, nullRows: [4, 30]);
        WriteSqliteTable(In("lab.db"), "readings", ("x", x), ("y", y));
        WriteCsv(In("lab.csv"), ("x", x), ("y", y));

        var csv = Fit(_temp.Path, "from-csv", "{path: lab.csv, missing: drop}", loss);
        var query = Fit(_temp.Path, "from-query", "{sqlite: lab.db, query: \"SELECT x, y FROM readings ORDER BY id\", missing: drop}", loss);

        AssertSameFit(csv, query);
        Assert.Equal(2, query.Data!.DroppedMissing);
    }

    [Fact]
    public void Integer_columns_computed_columns_and_where_clauses_are_read_as_numbers()
    {
        var (x, y) = Noise(30, seed: 3);
        WriteSqlite(In("mixed.db"), "CREATE TABLE m (id INTEGER PRIMARY KEY, k INTEGER, y REAL, site TEXT)");
        using (var connection = new SqliteConnection($"Data Source={In("mixed.db")};Pooling=False"))
        {
            connection.Open();
            for (var i = 0; i < x.Length; i++)
            {
                using var insert = connection.CreateCommand();
                insert.CommandText = "INSERT INTO m (k, y, site) VALUES ($k, $y, $site)";
                insert.Parameters.AddWithValue("$k", (long)Math.Round(x[i]!.Value * 100));
                insert.Parameters.AddWithValue("$y", y[i]!.Value);
                insert.Parameters.AddWithValue("$site", i % 2 == 0 ? "north" : "south");
                insert.ExecuteNonQuery();
            }
        }

        var xs = x.Select(v => (double?)(Math.Round(v!.Value * 100) / 100.0)).ToArray();
        var north = Enumerable.Range(0, x.Length).Where(i => i % 2 == 0).ToArray();
        WriteCsv(In("north.csv"), ("x", north.Select(i => xs[i]).ToArray()), ("y", north.Select(i => y[i]).ToArray()));

        var csv = Fit(_temp.Path, "north-csv", "{path: north.csv}");
        var query = Fit(_temp.Path, "north-query", "{sqlite: mixed.db, query: \"SELECT k / 100.0 AS x, y FROM m WHERE site = 'north' ORDER BY id\"}");

        AssertSameFit(csv, query);
    }

    [Fact]
    public void Result_json_names_the_database_and_the_query_and_the_digest_covers_both()
    {
        var (x, y) = Noise(12, seed: 1);
        WriteSqliteTable(In("p.db"), "t", ("x", x), ("y", y));
        const string Query = "SELECT x, y\nFROM t";

        var r = Fit(_temp.Path, "provenance", "{sqlite: p.db, query: \"SELECT x, y\\nFROM t\"}");

        AssertSolved(r);
        Assert.Equal("p.db (query: SELECT x, y FROM t)", r.Data!.File);
        var databaseSha = DataDigest.OfFile(In("p.db"));
        var expected = Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(databaseSha + "\n" + Query)));
        Assert.Equal(expected, r.Data.Sha256);
        Assert.Equal(expected, r.Provenance.DataSha256);
        Assert.Equal(expected, DataDigest.ForSpec(Assert.IsType<FitSpecDocument>(SpecReader.Read(In("provenance.fit.yaml")).Document)));

        var other = Fit(_temp.Path, "other-query", "{sqlite: p.db, query: \"SELECT x, y FROM t WHERE 1\"}");
        AssertSolved(other);
        Assert.NotEqual(r.Data.Sha256, other.Data!.Sha256);
        Assert.Equal(r.Coefficients.Select(c => c.Value), other.Coefficients.Select(c => c.Value));
    }

    [Fact]
    public void A_null_without_drop_is_an_error_naming_the_query_row_and_column()
    {
        var (x, y) = Noise(10, seed: 2, nullRows: [6]);
        WriteSqliteTable(In("n.db"), "t", ("x", x), ("y", y));

        var r = Fit(_temp.Path, "nulls", "{sqlite: n.db, query: \"SELECT x, y FROM t ORDER BY id\"}");

        Assert.Equal("error", r.Status);
        var e = Assert.Single(r.Errors);
        Assert.Equal(In("n.db"), Path.GetFullPath(e.File));
        Assert.Equal(7, e.Line);
        Assert.Equal("y", e.Field);
        Assert.StartsWith("query row 7: missing value (NULL)", e.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("missing: drop")]
    [InlineData("missing: error")]
    public void A_text_value_in_a_used_column_is_an_error_even_with_drop(string missing)
    {
        WriteSqlite(
            In("text.db"),
            "CREATE TABLE t (id INTEGER PRIMARY KEY, x, y REAL)",
            "INSERT INTO t (x, y) VALUES (1, 2), (2, 3.5), ('two and a half', 4), (3, 5), (4, 6.5)");

        var r = Fit(_temp.Path, "text", $"{{sqlite: text.db, query: \"SELECT x, y FROM t ORDER BY id\", {missing}}}");

        var e = Assert.Single(r.Errors);
        Assert.Equal(3, e.Line);
        Assert.Equal("x", e.Field);
        Assert.Contains("text value 'two and a half', not a number", e.Message, StringComparison.Ordinal);
        Assert.Contains("CAST(x AS REAL)", e.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("SELECT x, y FROM nope", "no such table: nope")]
    [InlineData("SELECT x, yy FROM t", "no such column: yy")]
    [InlineData("SELEC x, y FROM t", "must be one SELECT statement (it starts with SELEC)")]
    [InlineData("SELECT x y z FROM t", "syntax error")]
    public void A_query_sqlite_refuses_is_an_error_at_the_query_key_with_its_message(string query, string message)
    {
        WriteSqliteTable(In("q.db"), "t", ("x", [1.0, 2, 3]), ("y", [2.0, 3, 5]));
        var spec = SpecPath(_temp.Path, "refused", $"\n  sqlite: q.db\n  query: \"{query}\"", terms: "{b0: 1, b1: x}");

        var r = FitSpec.Pipeline.FitRunner.Run(spec);

        var e = Assert.Single(r.Errors);
        Assert.Equal(spec, e.File);
        Assert.Equal(5, e.Line);
        Assert.Equal(10, e.Column);
        Assert.Equal("data.query", e.Field);
        Assert.Contains(message, e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_column_the_model_uses_that_the_query_does_not_return_is_named_at_the_query()
    {
        WriteSqliteTable(In("c.db"), "t", ("load_kg", [1.0, 2, 3]), ("y", [2.0, 3, 5]));

        var r = Fit(_temp.Path, "no-column", "{sqlite: c.db, query: \"SELECT load_kg, y FROM t\"}", terms: "{b0: 1, b1: load_k}");

        var e = Assert.Single(r.Errors);
        Assert.Equal("data.query", e.Field);
        Assert.Contains("returns no column 'load_k' (did you mean 'load_kg'?)", e.Message, StringComparison.Ordinal);
        Assert.Contains("its columns are: load_kg, y", e.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("INSERT INTO t (x, y) VALUES (9, 9)")]
    [InlineData("UPDATE t SET y = 0")]
    [InlineData("DELETE FROM t")]
    [InlineData("DROP TABLE t")]
    [InlineData("-- a comment first\nDELETE FROM t")]
    [InlineData("WITH gone AS (SELECT 1) DELETE FROM t")]
    [InlineData("WITH gone AS (SELECT 1) DELETE FROM t RETURNING x, y")]
    [InlineData("SELECT x, y FROM t; DELETE FROM t")]
    [InlineData("SELECT x, y FROM t; ")]
    [InlineData("VALUES (1, 2); DROP TABLE t")]
    [InlineData("ATTACH DATABASE 'other.db' AS o")]
    [InlineData("PRAGMA user_version = 7")]
    public void A_query_that_would_write_is_refused_at_the_query_key_and_changes_nothing(string query)
    {
        WriteSqliteTable(In("w.db"), "t", ("x", [1.0, 2, 3, 4]), ("y", [2.0, 3, 5, 4]));
        var before = File.ReadAllBytes(In("w.db"));
        var spec = SpecPath(_temp.Path, "writes", $"\n  sqlite: w.db\n  query: \"{query.Replace("\n", "\\n", StringComparison.Ordinal)}\"", terms: "{b0: 1, b1: x}");

        var r = FitSpec.Pipeline.FitRunner.Run(spec);

        if (query.EndsWith("; ", StringComparison.Ordinal))
        {
            // A trailing ';' ends the one statement: nothing else follows, so it is run.
            AssertSolved(r);
        }
        else
        {
            var e = Assert.Single(r.Errors);
            Assert.Equal("data.query", e.Field);
            Assert.Equal((5, 10), (e.Line, e.Column));
        }

        Assert.Equal(before, File.ReadAllBytes(In("w.db")));
        Assert.False(File.Exists(In("other.db")));
        Assert.Equal(4, CountRows(In("w.db")));
    }

    [Fact]
    public void The_connection_is_read_only_so_sqlite_itself_refuses_a_write()
    {
        WriteSqliteTable(In("ro.db"), "t", ("x", [1.0]), ("y", [2.0]));
        var before = File.ReadAllBytes(In("ro.db"));

        using (var connection = SqliteQueryReader.OpenReadOnly(In("ro.db"), TimeSpan.FromSeconds(5)))
        {
            connection.Open();
            using var command = connection.CreateCommand();
            command.CommandText = "DELETE FROM t";
            var e = Assert.Throws<SqliteException>(() => command.ExecuteNonQuery());
            Assert.Equal(SQLitePCL.raw.SQLITE_READONLY, e.SqliteErrorCode);
        }

        Assert.Equal(before, File.ReadAllBytes(In("ro.db")));
    }

    [Fact]
    public void A_query_that_runs_past_the_time_limit_is_stopped_with_an_error_at_the_query()
    {
        WriteSqliteTable(In("slow.db"), "t", ("x", [1.0, 2]), ("y", [2.0, 3]));
        var spec = Assert.IsType<FitSpecDocument>(SpecReader.Read(SpecPath(
            _temp.Path,
            "slow",
            "{sqlite: slow.db, query: \"WITH RECURSIVE c(x) AS (SELECT 1 UNION ALL SELECT x + 1 FROM c) SELECT count(*) AS x, 1 AS y FROM c\"}",
            terms: "{b0: 1, b1: x}")).Document);
        var clock = Stopwatch.StartNew();

        var e = Assert.Throws<Diagnostics.FitSpecException>(() => TableLoader.Load(spec, new DataRequest(_ => ["x", "y"], null), TimeSpan.FromMilliseconds(300)));

        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(10), $"stopped after {clock.Elapsed}");
        var d = Assert.Single(e.Diagnostics);
        Assert.Equal("data.query", d.Field);
        Assert.Contains("ran longer than 0.3 s and was stopped", d.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_file_that_is_not_a_database_is_an_error_at_the_sqlite_key()
    {
        File.WriteAllText(In("fake.db"), "x,y\n1,2\n2,3\n3,5\n, and then some text that is no SQLite header at all\n");

        var r = Fit(_temp.Path, "fake", "{sqlite: fake.db, query: \"SELECT x, y FROM t\"}");

        var e = Assert.Single(r.Errors);
        Assert.Equal("data.sqlite", e.Field);
        Assert.Contains("cannot read the SQLite database", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_missing_database_file_is_an_error_at_the_sqlite_key()
    {
        var r = Fit(_temp.Path, "absent", "{sqlite: absent.db, query: \"SELECT x, y FROM t\"}");

        var e = Assert.Single(r.Errors);
        Assert.Equal("data.sqlite", e.Field);
        Assert.Contains("database file 'absent.db' not found", e.Message, StringComparison.Ordinal);
        Assert.False(File.Exists(In("absent.db")));
    }

    [Fact]
    public void A_query_without_rows_says_so_at_the_query()
    {
        WriteSqliteTable(In("e.db"), "t", ("x", [1.0, 2]), ("y", [2.0, 3]));

        var r = Fit(_temp.Path, "none", "{sqlite: e.db, query: \"SELECT x, y FROM t WHERE x > 5\"}");

        Assert.Contains("the query returned no rows", Assert.Single(r.Errors).Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Two_result_columns_with_one_name_are_refused()
    {
        WriteSqliteTable(In("d.db"), "t", ("x", [1.0, 2]), ("y", [2.0, 3]));

        var r = Fit(_temp.Path, "twice", "{sqlite: d.db, query: \"SELECT x, y, y AS x FROM t\"}");

        Assert.Contains("more than one column named 'x'", Assert.Single(r.Errors).Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Uncheckpointed_write_ahead_log_changes_are_refused_because_the_digest_would_miss_them()
    {
        WriteSqliteTable(In("wal.db"), "t", ("x", [1.0, 2, 3]), ("y", [2.0, 3, 5]));
        File.WriteAllBytes(In("wal.db-wal"), [1, 2, 3]);

        var r = Fit(_temp.Path, "wal", "{sqlite: wal.db, query: \"SELECT x, y FROM t\"}", terms: "{b0: 1, b1: x}");

        var e = Assert.Single(r.Errors);
        Assert.Equal("data.sqlite", e.Field);
        Assert.Contains("wal_checkpoint", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void The_bundled_native_sqlite_library_loads()
    {
        using var connection = new SqliteConnection("Data Source=:memory:");
        connection.Open();

        Assert.True(SQLitePCL.raw.sqlite3_libversion_number() >= 3_040_000, SQLitePCL.raw.sqlite3_libversion().utf8_to_string());
    }

    private static long CountRows(string database)
    {
        using var connection = SqliteQueryReader.OpenReadOnly(database, TimeSpan.FromSeconds(5));
        connection.Open();
        using var command = connection.CreateCommand();
        command.CommandText = "SELECT count(*) FROM t";
        return (long)command.ExecuteScalar()!;
    }

    public void Dispose() => _temp.Dispose();
}
