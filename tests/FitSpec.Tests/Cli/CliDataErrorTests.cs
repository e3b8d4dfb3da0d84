using System.Globalization;
using static FitSpec.Tests.Cli.CliSpecs;

namespace FitSpec.Tests.Cli;

/// <summary>Invalid data: exit 2 and one `DATAFILE:LINE: error: column 'name': message` line (the header is line 1).</summary>
public sealed class CliDataErrorTests
{
    [Theory]
    [InlineData("x", "b1: z", "z")]
    [InlineData("response", "response: yy", "yy")]
    public void Missing_column_exits_2_naming_the_data_file_line_1_and_the_column(string what, string edit, string column)
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", SampleData);
        var yaml = Linear("nocol").Replace(what == "x" ? "b1: x" : "response: y", edit, StringComparison.Ordinal);
        var spec = cli.Write("nocol.fit.yaml", yaml);
        var run = cli.Run("solve", spec, "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var error = SingleError(run, DataError());
        Assert.Equal("d.csv", error.Groups["file"].Value);
        Assert.Equal("1", error.Groups["line"].Value);
        Assert.Equal(column, error.Groups["column"].Value);
    }

    /// <summary>A non-numeric cell in a used column: its data line (header = line 1) and its column.</summary>
    [Theory]
    [InlineData("y", 4)]
    [InlineData("x", 6)]
    public void Non_numeric_cell_exits_2_with_data_line_and_column(string column, int line)
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", WithBadCell(column, line));
        var spec = cli.Write("nonnum.fit.yaml", Linear("nonnum"));
        var run = cli.Run("solve", spec, "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var error = SingleError(run, DataError());
        Assert.Equal($"d.csv:{line}:{column}", $"{error.Groups["file"].Value}:{error.Groups["line"].Value}:{error.Groups["column"].Value}");

        var result = cli.Json("out/nonnum.result.json");
        Assert.Equal("error", result.GetProperty("status").GetString());
        var entry = Assert.Single(result.GetProperty("errors").EnumerateArray());
        Assert.Equal("d.csv", entry.GetProperty("file").GetString());
        Assert.Equal(line, entry.GetProperty("line").GetInt32());
        Assert.Equal(System.Text.Json.JsonValueKind.Null, entry.GetProperty("column").ValueKind);
        Assert.Equal(column, entry.GetProperty("field").GetString());
    }

    /// <summary>With data.missing: drop the bad row is left out and counted; the fit equals the fit of the data without it.</summary>
    [Fact]
    public void Non_numeric_cell_with_missing_drop_is_dropped_and_counted()
    {
        using var cli = new CliHarness();
        cli.Write("bad.csv", WithBadCell("x", 6));
        var without = string.Join('\n', SampleData.Split('\n').Where((_, i) => i != 5));
        cli.Write("clean.csv", without);
        var dropSpec = cli.Write("drop.fit.yaml", Linear("drop", "bad.csv", dataExtra: "  missing: drop\n"));
        var cleanSpec = cli.Write("clean.fit.yaml", Linear("clean", "clean.csv"));
        var run = cli.Run("solve", dropSpec, cleanSpec, "--out", "out");
        Assert.True(run.ExitCode == 0, run.ToString());
        var drop = cli.Json("out/drop.result.json");
        var clean = cli.Json("out/clean.result.json");
        var data = drop.GetProperty("data");
        Assert.Equal(6, data.GetProperty("rows").GetInt32());
        Assert.Equal(5, data.GetProperty("used").GetInt32());
        Assert.Equal(1, data.GetProperty("dropped_missing").GetInt32());
        Assert.Equal(5, drop.GetProperty("metrics").GetProperty("observations").GetInt32());
        Assert.Equal(clean.GetProperty("objective").GetDouble(), drop.GetProperty("objective").GetDouble(), 12);
        Assert.Equal(clean.GetProperty("coefficients").GetProperty("b1").GetDouble(), drop.GetProperty("coefficients").GetProperty("b1").GetDouble(), 12);
    }

    /// <summary>A row with more cells than the header: one error line naming the data line.</summary>
    [Fact]
    public void Ragged_row_exits_2_with_one_error_line_naming_the_data_line()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", "x,y\n1,2.1\n2,3.9\n3,6.2,7\n4,7.8\n");
        var spec = cli.Write("ragged.fit.yaml", Linear("ragged"));
        var run = cli.Run("solve", spec, "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var line = Assert.Single(run.StderrLines);
        Assert.StartsWith("d.csv:4: error:", line, StringComparison.Ordinal);
    }

    /// <summary>
    /// Spec errors name the spec as given on the command line; data errors must name the data file so that it
    /// can be opened from the same working directory (here the spec and its data sit in a sub-folder).
    /// </summary>
    [Fact]
    public void Data_error_names_a_path_that_resolves_from_the_working_directory()
    {
        using var cli = new CliHarness();
        cli.Write("sub/d.csv", WithBadCell("y", 4));
        var spec = cli.Write("sub/nonnum.fit.yaml", Linear("nonnum"));
        var run = cli.Run("solve", spec, "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var error = SingleError(run, DataError());
        var named = Path.GetFullPath(Path.Combine(cli.Folder, error.Groups["file"].Value));
        Assert.True(named == Path.GetFullPath(Path.Combine(cli.Folder, "sub", "d.csv")), $"the error names '{error.Groups["file"].Value}', which is not the data file sub/d.csv seen from the working directory: {run}");
    }

    private static string WithBadCell(string column, int line)
    {
        var lines = SampleData.Split('\n');
        var cells = lines[line - 1].Split(',');
        cells[column == "x" ? 0 : 1] = "abc";
        lines[line - 1] = string.Join(',', cells);
        Assert.True(line >= 2 && line <= 7, line.ToString(CultureInfo.InvariantCulture));
        return string.Join('\n', lines);
    }
}
