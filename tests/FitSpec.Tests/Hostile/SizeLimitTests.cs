using FitSpec.Data;
using FitSpec.Design;
using FitSpec.Diagnostics;
using FitSpec.Tests.Cli;
using static FitSpec.Tests.Cli.CliSpecs;

namespace FitSpec.Tests.Hostile;

/// <summary>
/// Specs and data that ask for more than one fit may hold end in a located error naming the limit, before the
/// memory is allocated: too many coefficients, too large a design, too large a data file, too many rows.
/// </summary>
public sealed class SizeLimitTests
{
    [Fact]
    public void A_glob_over_a_very_wide_file_is_refused_at_the_term()
    {
        using var cli = new CliHarness();
        var width = DesignLimits.MaxCoefficients + 1;
        var header = string.Join(',', Enumerable.Range(0, width).Select(j => $"a{j}")) + ",y";
        var row = string.Join(',', Enumerable.Repeat("1", width)) + ",2";
        cli.Write("wide.csv", $"{header}\n{row}\n{row}\n");
        var yaml = "fitspec: 1\nname: wide\ndata: {path: wide.csv}\nmodel:\n  response: y\n  terms:\n    a: {columns: \"a*\"}\nloss: l2\n";
        cli.Write("wide.fit.yaml", yaml);
        var run = cli.Run("solve", "wide.fit.yaml", "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var error = SingleError(run, SpecError());
        Assert.Equal(Locate(yaml, "\"a*\"").Line.ToString(System.Globalization.CultureInfo.InvariantCulture), error.Groups["line"].Value);
        Assert.Contains($"{width:N0} coefficients", error.Groups["msg"].Value, StringComparison.Ordinal);
    }

    [Fact]
    public void A_design_larger_than_the_cell_limit_is_refused_before_its_columns_are_made()
    {
        // 30,000 rows × 10,002 spline coefficients = 3.0e8 cells > 2.5e8; the file itself is small.
        using var cli = new CliHarness();
        cli.Write("long.csv", "x,y\n" + string.Concat(Enumerable.Range(0, 30_000).Select(i => $"{i},{i % 7}\n")));
        var yaml = "fitspec: 1\nname: long\ndata: {path: long.csv}\nmodel:\n  response: y\n  terms:\n    s: {spline: x, knots: 10000}\nloss: l2\n";
        cli.Write("long.fit.yaml", yaml);
        var run = cli.Run("solve", "long.fit.yaml", "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var error = SingleError(run, SpecError());
        Assert.Contains("30,000 rows × 10,002 coefficients", error.Groups["msg"].Value, StringComparison.Ordinal);
    }

    [Fact]
    public void A_data_file_above_the_size_limit_is_refused_without_reading_it()
    {
        using var cli = new CliHarness();
        // A sparse file: its length is past the limit, its blocks are not allocated.
        using (var stream = new FileStream(Path.Combine(cli.Folder, "huge.csv"), FileMode.CreateNew))
        {
            stream.SetLength(TableLoader.MaxFileBytes + 1);
        }

        cli.Write("huge.fit.yaml", Linear("huge", "huge.csv"));
        var run = cli.Run("solve", "huge.fit.yaml", "--out", "out");
        Assert.True(run.ExitCode == 2, run.ToString());
        var error = SingleError(run, SpecError());
        Assert.Contains("more than the 16 GiB one fit may read", error.Groups["msg"].Value, StringComparison.Ordinal);
    }

    [Fact]
    public void Rows_past_the_reader_limit_stop_at_the_first_row_too_many()
    {
        using var temp = new Support.TempFolder();
        var path = Path.Combine(temp.Path, "d.csv");
        File.WriteAllText(path, SampleData);
        var e = Assert.Throws<FitSpecException>(() => CsvColumnReader.Read(path, "d.csv", ',', h => h, dropMissing: false, maxRows: 4));
        var d = Assert.Single(e.Diagnostics);
        Assert.Equal(6, d.Line); // header on line 1, rows on lines 2..5 are the four allowed
        Assert.Contains("more than 4 data rows", d.Message, StringComparison.Ordinal);
    }
}
