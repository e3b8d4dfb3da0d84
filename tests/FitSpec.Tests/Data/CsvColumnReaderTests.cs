using FitSpec.Data;
using FitSpec.Diagnostics;

namespace FitSpec.Tests.Data;

public sealed class CsvColumnReaderTests : IDisposable
{
    private readonly Support.TempFolder _temp = new("fitspec-csv");

    private RawColumns Read(string text, bool drop = false, char separator = ',', string[]? columns = null)
    {
        var path = Path.Combine(_temp.Path, "d.csv");
        File.WriteAllText(path, text);
        return CsvColumnReader.Read(path, "d.csv", separator, header => (IReadOnlyList<string>?)columns ?? header, drop, 1000);
    }

    [Fact]
    public void Reads_requested_columns_with_file_lines()
    {
        var r = Read("x,y,z\n1,2,a\n3.5,-4e-3,b\n", columns: ["y", "x"]);
        Assert.Equal([2, 3], r.Lines);
        Assert.Equal([2.0, -4e-3], r.Columns["y"]);
        Assert.Equal([1.0, 3.5], r.Columns["x"]);
    }

    [Theory]
    [InlineData("1,5", '\t')]
    [InlineData("1.5x", ',')]
    [InlineData("NaN", ',')]
    [InlineData("-inf", ',')]
    [InlineData("", ',')]
    public void Non_numbers_are_errors_naming_line_and_column(string cell, char separator)
    {
        var text = $"x{separator}y\n1{separator}2\n2{separator}{cell}\n";
        var e = Assert.Throws<FitSpecException>(() => Read(text, separator: separator));
        var d = Assert.Single(e.Diagnostics);
        Assert.Equal(3, d.Line);
        Assert.Equal("y", d.Field);
        Assert.StartsWith("d.csv:3: error: column 'y':", d.ToString(), StringComparison.Ordinal);
    }

    [Fact]
    public void Drop_counts_rows_with_missing_values()
    {
        var r = Read("x,y\n1,2\n2,\n3,4\n", drop: true);
        Assert.Equal(1, r.MissingCount);
        Assert.Equal([false, true, false], r.Missing);
    }

    [Fact]
    public void Quoted_fields_and_spaces_are_accepted()
    {
        var r = Read("\"x\",y\n\" 1.5\", 2 \n");
        Assert.Equal([1.5], r.Columns["x"]);
        Assert.Equal([2.0], r.Columns["y"]);
    }

    [Fact]
    public void A_ragged_row_is_one_located_error()
    {
        var e = Assert.Throws<FitSpecException>(() => Read("x,y\n1,2\n3,6.2,7\n"));
        Assert.Equal(3, Assert.Single(e.Diagnostics).Line);
    }

    [Fact]
    public void A_missing_column_is_named_with_a_suggestion()
    {
        var e = Assert.Throws<FitSpecException>(() => Read("load_kg,y\n1,2\n", columns: ["load_k"]));
        Assert.Contains("did you mean 'load_kg'", Assert.Single(e.Diagnostics).Message, StringComparison.Ordinal);
    }

    public void Dispose() => _temp.Dispose();
}
