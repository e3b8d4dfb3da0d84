using FitSpec.Data;
using FitSpec.Diagnostics;
using FitSpec.Spec;
using static FitSpec.Tests.Data.DataFiles;

namespace FitSpec.Tests.Data;

public sealed class ParquetSourceTests : IDisposable
{
    private readonly Support.TempFolder _temp = new("fitspec-parquet");

    private string In(string name) => Path.Combine(_temp.Path, name);

    // The x column in each numeric Parquet type; the CSV holds the same numbers as doubles.
    public static TheoryData<string, string> Types() => new()
    {
        { "double", "l2" },
        { "double-required", "l1" },
        { "float", "l2" },
        { "decimal", "l2" },
        { "int32", "l2" },
        { "int64", "l1" },
        { "int16", "l2" },
    };

    [Theory]
    [MemberData(nameof(Types))]
    public async Task A_parquet_file_fits_like_the_same_numbers_in_csv(string type, string loss)
    {
        var (x, y) = Noise(40, seed: 11, nullRows: [3, 17]);
        var asDouble = type switch
        {
            "float" => x.Select(v => (double?)(float)v!.Value).ToArray(),
            "decimal" => x.Select(v => (double?)(double)(decimal)v!.Value).ToArray(),
            "int32" or "int64" or "int16" => x.Select(v => (double?)Math.Round(v!.Value)).ToArray(),
            _ => x,
        };
        var column = type switch
        {
            "double" => Numbers("x", x),
            "double-required" => Numbers("x", x, nullable: false),
            "float" => Numbers("x", x.Select(v => (float?)(float)v!.Value).ToArray(), nullable: false),
            "decimal" => Decimals("x", x.Select(v => (decimal?)(decimal)v!.Value).ToArray()),
            "int32" => Numbers("x", asDouble.Select(v => (int?)(int)v!.Value).ToArray()),
            "int64" => Numbers("x", asDouble.Select(v => (long?)(long)v!.Value).ToArray(), nullable: false),
            "int16" => Numbers("x", asDouble.Select(v => (short?)(short)v!.Value).ToArray()),
            _ => throw new ArgumentOutOfRangeException(nameof(type)),
        };

        await WriteParquet(In("d.parquet"), 16, column, Numbers("y", y), Texts("note", [.. x.Select(_ => "unused text")]));
        WriteCsv(In("d.csv"), ("x", asDouble), ("y", y));

        var csv = Fit(_temp.Path, "from-csv", "{path: d.csv, missing: drop}", loss);
        var parquet = Fit(_temp.Path, "from-parquet", "{path: d.parquet, missing: drop}", loss);

        AssertSameFit(csv, parquet);
        Assert.Equal(2, parquet.Data!.DroppedMissing);
        Assert.Equal("d.parquet", parquet.Data.File);
        Assert.Equal(DataDigest.OfFile(In("d.parquet")), parquet.Data.Sha256);
        Assert.Equal(parquet.Data.Sha256, parquet.Provenance.DataSha256);
    }

    [Fact]
    public async Task A_filter_and_a_weight_read_parquet_columns_like_csv_ones()
    {
        var (x, y) = Noise(30, seed: 4);
        var w = x.Select((_, i) => (double?)(1 + (i % 3))).ToArray();
        await WriteParquet(In("w.parquet"), 7, Numbers("x", x), Numbers("y", y), Numbers("w", w.Select(v => (long?)(long)v!.Value).ToArray()));
        WriteCsv(In("w.csv"), ("x", x), ("y", y), ("w", w));

        var csv = Fit(_temp.Path, "w-csv", "{path: w.csv, filter: \"x > 1\", weight: w}");
        var parquet = Fit(_temp.Path, "w-parquet", "{path: w.parquet, filter: \"x > 1\", weight: w}");

        AssertSameFit(csv, parquet);
        Assert.True(parquet.Data!.DroppedFilter > 0);
    }

    [Fact]
    public async Task A_null_without_drop_is_an_error_naming_the_row_across_row_groups_and_the_column()
    {
        var (x, y) = Noise(12, seed: 2, nullRows: [9]);
        await WriteParquet(In("n.parquet"), 5, Numbers("x", x), Numbers("y", y));

        var r = Fit(_temp.Path, "nulls", "{path: n.parquet}");

        Assert.Equal("error", r.Status);
        var e = Assert.Single(r.Errors);
        Assert.Equal(In("n.parquet"), Path.GetFullPath(e.File));
        Assert.Equal(10, e.Line);
        Assert.Null(e.Column);
        Assert.Equal("y", e.Field);
        Assert.StartsWith("row 10: missing value", e.Message, StringComparison.Ordinal);
        Assert.Contains("data.missing: drop", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task NaN_and_infinite_values_are_missing_like_in_csv()
    {
        var (x, y) = Noise(10, seed: 6);
        y[2] = double.NaN;
        y[6] = double.PositiveInfinity;
        await WriteParquet(In("nan.parquet"), 100, Numbers("x", x), Numbers("y", y, nullable: false));

        var dropped = Fit(_temp.Path, "nan-drop", "{path: nan.parquet, missing: drop}");
        AssertSolved(dropped);
        Assert.Equal(2, dropped.Data!.DroppedMissing);

        var refused = Fit(_temp.Path, "nan-error", "{path: nan.parquet}");
        Assert.Equal([3, 7], refused.Errors.Select(e => e.Line));
        Assert.Contains("not a finite number", refused.Errors[1].Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Row_numbers_count_every_row_read_across_row_groups()
    {
        var (x, y) = Noise(11, seed: 8);
        await WriteParquet(In("rows.parquet"), 4, Numbers("x", x), Numbers("y", y));

        var table = TableLoader.Load(Spec("rows", "{path: rows.parquet}"), Request("x", "y"));

        Assert.Equal(Enumerable.Range(1, 11), table.Lines);
        Assert.Equal(x.Select(v => v!.Value), table.Columns["x"]);
        Assert.Equal(["x", "y"], table.Header);
    }

    [Theory]
    [InlineData("text", "text (string)")]
    [InlineData("flag", "boolean")]
    [InlineData("when", "timestamp")]
    public async Task A_non_numeric_column_the_model_uses_is_an_error_naming_it_and_its_type(string column, string typeName)
    {
        var (x, y) = Noise(6, seed: 1);
        await WriteParquet(
            In("t.parquet"),
            100,
            Numbers("x", x),
            Numbers("y", y),
            Texts("text", [.. x.Select(v => v!.Value.ToString(System.Globalization.CultureInfo.InvariantCulture))]),
            Numbers("flag", x.Select(v => (bool?)(v > 5)).ToArray(), nullable: false),
            Numbers("when", x.Select(_ => (DateTime?)new DateTime(2024, 5, 1, 0, 0, 0, DateTimeKind.Utc)).ToArray()));

        var r = Fit(_temp.Path, "types-" + column, "{path: t.parquet}", terms: $"{{b0: 1, b1: {column}}}");

        Assert.Equal("error", r.Status);
        var e = Assert.Single(r.Errors);
        Assert.Equal(column, e.Field);
        Assert.Contains($"column '{column}' holds {typeName} values, not numbers", e.Message, StringComparison.Ordinal);
        Assert.Equal(In("t.parquet"), Path.GetFullPath(e.File));
    }

    [Fact]
    public async Task A_column_not_in_the_file_is_named_with_a_suggestion()
    {
        var (x, y) = Noise(6, seed: 1);
        await WriteParquet(In("m.parquet"), 100, Numbers("load_kg", x), Numbers("y", y));

        var r = Fit(_temp.Path, "missing-column", "{path: m.parquet}", terms: "{b0: 1, b1: load_k}");

        var e = Assert.Single(r.Errors);
        Assert.Equal("load_k", e.Field);
        Assert.Contains("did you mean 'load_kg'", e.Message, StringComparison.Ordinal);
        Assert.Contains("columns are: load_kg, y", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_columns_term_expands_over_the_parquet_schema()
    {
        var (x, y) = Noise(20, seed: 3);
        var x2 = x.Select(v => v * v).ToArray();
        await WriteParquet(In("g.parquet"), 100, Numbers("a1", x), Numbers("a2", x2), Numbers("y", y));
        WriteCsv(In("g.csv"), ("a1", x), ("a2", x2), ("y", y));

        var csv = Fit(_temp.Path, "glob-csv", "{path: g.csv}", terms: "{b0: 1, a: {columns: \"a*\"}}");
        var parquet = Fit(_temp.Path, "glob-parquet", "{path: g.parquet}", terms: "{b0: 1, a: {columns: \"a*\"}}");

        AssertSameFit(csv, parquet);
        Assert.Equal(["b0", "a1", "a2"], parquet.Coefficients.Select(c => c.Name));
    }

    [Fact]
    public async Task An_empty_parquet_file_says_it_has_no_rows()
    {
        await WriteParquet(In("empty.parquet"), 10, Numbers("x", Array.Empty<double?>()), Numbers("y", Array.Empty<double?>()));

        var r = Fit(_temp.Path, "empty", "{path: empty.parquet}");

        Assert.Contains("no rows", Assert.Single(r.Errors).Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_file_that_is_not_parquet_is_a_clean_error()
    {
        File.WriteAllText(In("fake.parquet"), "x,y\n1,2\n3,4\n");

        var r = Fit(_temp.Path, "fake", "{path: fake.parquet}");

        Assert.Equal("error", r.Status);
        Assert.Contains("cannot read the Parquet file", Assert.Single(r.Errors).Message, StringComparison.Ordinal);
    }

    // Truncations and byte flips at seeded places: every outcome is a result (a fit or located errors),
    // never an exception out of the runner.
    [Fact]
    public async Task A_damaged_parquet_file_gives_an_error_result_never_an_exception()
    {
        var (x, y) = Noise(200, seed: 12, nullRows: [5]);
        await WriteParquet(In("good.parquet"), 64, Numbers("x", x), Numbers("y", y));
        var good = await File.ReadAllBytesAsync(In("good.parquet"));
        var random = new Random(21);
        var damaged = new List<byte[]>
        {
            good[..(good.Length / 2)],
            good[..^1],
            good[..^9],
            good[..4].Concat(new byte[good.Length - 8]).Concat(good[^4..]).ToArray(),
        };
        for (var k = 0; k < 40; k++)
        {
            var copy = (byte[])good.Clone();
            var at = random.Next(4, good.Length - 4);
            copy[at] ^= (byte)(1 + random.Next(255));
            damaged.Add(copy);
        }

        var errors = 0;
        for (var k = 0; k < damaged.Count; k++)
        {
            await File.WriteAllBytesAsync(In("bad.parquet"), damaged[k]);
            var r = Fit(_temp.Path, $"bad{k}", "{path: bad.parquet, missing: drop}");
            Assert.True(r.Status is "optimal" or "error", $"case {k}: {r.Status}");
            if (r.Status == "error")
            {
                errors++;
                Assert.All(r.Errors, e => Assert.False(string.IsNullOrWhiteSpace(e.Message)));
                Assert.Contains(r.Errors, e => e.File.EndsWith("bad.parquet", StringComparison.Ordinal) || e.Field is not null);
            }
        }

        Assert.True(errors >= 4, $"only {errors} of {damaged.Count} damaged files were refused");
    }

    [Fact]
    public async Task The_row_limit_is_checked_before_reading()
    {
        var (x, y) = Noise(30, seed: 5);
        await WriteParquet(In("big.parquet"), 10, Numbers("x", x), Numbers("y", y));

        var e = Assert.Throws<FitSpecException>(() => ParquetColumnReader.Read(In("big.parquet"), "big.parquet", h => h, false, 29));

        Assert.Contains("more than 29 data rows", Assert.Single(e.Diagnostics).Message, StringComparison.Ordinal);
    }

    private FitSpecDocument Spec(string name, string data)
    {
        var path = SpecPath(_temp.Path, name, data);
        return Assert.IsType<FitSpecDocument>(SpecReader.Read(path).Document);
    }

    private static DataRequest Request(params string[] columns) => new(_ => columns, null);

    public void Dispose() => _temp.Dispose();
}
