using System.Globalization;
using System.Text;
using FitSpec.Pipeline;
using FitSpec.Results;
using Microsoft.Data.Sqlite;
using Parquet;
using Parquet.Schema;

namespace FitSpec.Tests.Data;

/// <summary>One column of a Parquet file written by a test: its schema field and how to write a slice of it.</summary>
internal sealed record ParquetColumn(DataField Field, int Count, Func<ParquetRowGroupWriter, int, int, Task> Write);

/// <summary>
/// Writes the small data files the data-source tests read (CSV, Parquet, SQLite), with the same packages
/// the tool reads them with, and specs that fit them. The numbers are seeded noise: these tests check
/// behaviour (the same data gives the same fit whatever the source), not reference values.
/// </summary>
internal static class DataFiles
{
    public static ParquetColumn Numbers<T>(string name, T?[] values, bool nullable = true)
        where T : struct
    {
        var field = new DataField(name, typeof(T), isNullable: nullable);
        return new ParquetColumn(field, values.Length, (group, start, count) => nullable
            ? group.WriteAsync<T>(field, values.AsMemory(start, count), null, null, CancellationToken.None)
            : group.WriteAsync<T>(field, values.Skip(start).Take(count).Select(v => v!.Value).ToArray().AsMemory(), null, null, CancellationToken.None));
    }

    public static ParquetColumn Decimals(string name, decimal?[] values)
    {
        var field = new DecimalDataField(name, 18, 6, isNullable: true);
        return new ParquetColumn(field, values.Length, (group, start, count) =>
            group.WriteAsync<decimal>(field, values.AsMemory(start, count), null, null, CancellationToken.None));
    }

    public static ParquetColumn Texts(string name, string[] values)
    {
        var field = new DataField<string>(name);
        return new ParquetColumn(field, values.Length, (group, start, count) => group.WriteAsync(field, values[start..(start + count)], null));
    }

    /// <summary>Writes the columns as a Parquet file, in row groups of at most rowGroupSize rows.</summary>
    public static async Task WriteParquet(string path, int rowGroupSize, params ParquetColumn[] columns)
    {
        var rows = columns[0].Count;
        await using var stream = File.Create(path);
        var writer = await ParquetWriter.CreateAsync(new ParquetSchema(columns.Select(c => (Field)c.Field)), stream);
        await using (writer)
        {
            for (var start = 0; start < rows; start += rowGroupSize)
            {
                var count = Math.Min(rowGroupSize, rows - start);
                using var group = writer.CreateRowGroup();
                foreach (var column in columns)
                {
                    await column.Write(group, start, count);
                }
            }
        }
    }

    /// <summary>Writes a CSV file of the columns; null is an empty cell, numbers are written exactly ("R").</summary>
    public static void WriteCsv(string path, params (string Name, double?[] Values)[] columns)
    {
        var text = new StringBuilder(string.Join(',', columns.Select(c => c.Name))).Append('\n');
        for (var i = 0; i < columns[0].Values.Length; i++)
        {
            text.Append(string.Join(',', columns.Select(c => c.Values[i] is { } v ? v.ToString("R", CultureInfo.InvariantCulture) : ""))).Append('\n');
        }

        File.WriteAllText(path, text.ToString());
    }

    /// <summary>Creates an SQLite database and runs the statements on it (a writable connection, closed after).</summary>
    public static void WriteSqlite(string path, params string[] statements)
    {
        using var connection = new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = path, Pooling = false }.ToString());
        connection.Open();
        using var transaction = connection.BeginTransaction();
        foreach (var sql in statements)
        {
            using var command = connection.CreateCommand();
            command.CommandText = sql;
            command.ExecuteNonQuery();
        }

        transaction.Commit();
    }

    /// <summary>Creates an SQLite table 'name' of REAL columns holding the values (null as NULL).</summary>
    public static void WriteSqliteTable(string path, string table, params (string Name, double?[] Values)[] columns)
    {
        using var connection = new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = path, Pooling = false }.ToString());
        connection.Open();
        using var transaction = connection.BeginTransaction();
        using (var create = connection.CreateCommand())
        {
            create.CommandText = $"CREATE TABLE {table} (id INTEGER PRIMARY KEY, {string.Join(", ", columns.Select(c => c.Name + " REAL"))})";
            create.ExecuteNonQuery();
        }

        using var insert = connection.CreateCommand();
        insert.CommandText = $"INSERT INTO {table} ({string.Join(", ", columns.Select(c => c.Name))}) VALUES ({string.Join(", ", columns.Select((_, k) => $"$v{k}"))})";
        var parameters = columns.Select((_, k) => insert.Parameters.Add($"$v{k}", SqliteType.Real)).ToArray();
        for (var i = 0; i < columns[0].Values.Length; i++)
        {
            for (var k = 0; k < columns.Length; k++)
            {
                parameters[k].Value = columns[k].Values[i] is { } v ? v : DBNull.Value;
            }

            insert.ExecuteNonQuery();
        }

        transaction.Commit();
    }

    /// <summary>Seeded noise around a quadratic, with nulls in y at the given rows (0-based).</summary>
    public static (double?[] X, double?[] Y) Noise(int n, int seed, params int[] nullRows)
    {
        var random = new Random(seed);
        var x = new double?[n];
        var y = new double?[n];
        for (var i = 0; i < n; i++)
        {
            var xi = Math.Round(random.NextDouble() * 10, 3);
            x[i] = xi;
            y[i] = 2 + (0.7 * xi) - (0.03 * xi * xi) + ((random.NextDouble() - 0.5) * 2);
        }

        foreach (var i in nullRows)
        {
            y[i] = null;
        }

        return (x, y);
    }

    /// <summary>Writes a spec in the folder with the given data section (YAML flow mapping text) and runs it.</summary>
    public static FitResult Fit(string folder, string name, string data, string loss = "l2", string terms = "{b0: 1, b1: x, b2: x^2}")
    {
        var spec = SpecPath(folder, name, data, loss, terms);
        return FitRunner.Run(spec);
    }

    public static string SpecPath(string folder, string name, string data, string loss = "l2", string terms = "{b0: 1, b1: x, b2: x^2}")
    {
        var spec = Path.Combine(folder, name + ".fit.yaml");
        File.WriteAllText(spec, $"fitspec: 1\nname: {name}\ndata: {data}\nmodel:\n  response: y\n  terms: {terms}\nloss: {loss}\n");
        return spec;
    }

    public static void AssertSolved(FitResult r) =>
        Assert.True(r.Status == "optimal", $"{r.Name}: {r.Status} {r.StatusDetail} {string.Join("; ", r.Errors.Select(e => $"{e.File}:{e.Line}: {e.Message}"))}");

    /// <summary>The law: the same rows, whatever file they came from, give the same fit, bit for bit.</summary>
    public static void AssertSameFit(FitResult expected, FitResult actual)
    {
        AssertSolved(expected);
        AssertSolved(actual);
        Assert.Equal(expected.Coefficients.Select(c => c.Name), actual.Coefficients.Select(c => c.Name));
        Assert.Equal(expected.Coefficients.Select(c => c.Value), actual.Coefficients.Select(c => c.Value));
        Assert.Equal(expected.Objective, actual.Objective);
        Assert.Equal(expected.Data!.Rows, actual.Data!.Rows);
        Assert.Equal(expected.Data.Used, actual.Data.Used);
        Assert.Equal(expected.Data.DroppedMissing, actual.Data.DroppedMissing);
        Assert.Equal(expected.Data.DroppedFilter, actual.Data.DroppedFilter);
    }
}
