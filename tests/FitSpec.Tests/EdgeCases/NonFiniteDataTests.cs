using FitSpec.Tests.Cli;
using static FitSpec.Tests.EdgeCases.EdgeSpecs;

namespace FitSpec.Tests.EdgeCases;

/// <summary>
/// NaN and infinities written as CSV text in a column the model uses: a data error at that file line (header = line
/// 1) and column, exit 2, with the way out (`data.missing: drop`); nothing is solved.
/// </summary>
public sealed class NonFiniteDataTests(NonFiniteDataTests.Batch batch) : IClassFixture<NonFiniteDataTests.Batch>
{
    /// <summary>Fit name, column, cell text (placed on file line 4).</summary>
    public static readonly TheoryData<string, string, string> Cells = new()
    {
        { "y-nan", "y", "nan" },
        { "y-nan-mixed-case", "y", "NaN" },
        { "y-inf", "y", "inf" },
        { "y-minus-inf", "y", "-inf" },
        { "y-infinity", "y", "Infinity" },
        { "x-nan", "x", "nan" },
        { "x-nan-mixed-case", "x", "NaN" },
        { "x-inf", "x", "inf" },
        { "x-minus-inf", "x", "-inf" },
        { "x-minus-infinity", "x", "-Infinity" },
    };

    [Fact]
    public void Batch_of_non_finite_cells_exits_2()
    {
        Assert.True(batch.Run.ExitCode == 2, batch.Run.ToString());
    }

    [Theory]
    [MemberData(nameof(Cells))]
    public void Non_finite_text_in_a_used_column_is_a_data_error_at_its_line_and_column(string name, string column, string text)
    {
        var run = batch.RunOf(name);

        Assert.True(run.ExitCode == 2, run.ToString());
        var error = DataErrorAt(run, name + "/d.csv", 4);
        Assert.Equal(column, error.Groups["column"].Value);
        Assert.Contains($"'{text}'", error.Groups["msg"].Value, StringComparison.Ordinal);
        Assert.Contains("data.missing: drop", error.Groups["msg"].Value, StringComparison.Ordinal);
        Assert.Contains("not a finite number", error.Groups["msg"].Value, StringComparison.Ordinal);

        var result = batch.Result(name);
        Assert.Equal("error", result.GetProperty("status").GetString());
        var entry = Assert.Single(result.GetProperty("errors").EnumerateArray());
        Assert.Equal(4, entry.GetProperty("line").GetInt32());
        Assert.Equal(column, entry.GetProperty("field").GetString());
    }

    /// <summary>Every bad cell is reported, each on its own line; `check` reports the same as `solve`.</summary>
    [Fact]
    public void Check_reports_each_non_finite_cell_on_its_own_line()
    {
        using var cli = new CliHarness();
        var rows = Rows.ToArray();
        rows[1] = "nan,3.9";
        rows[4] = "5,Infinity";
        cli.Write("d.csv", Csv(Header, rows));
        var spec = cli.Write("two.fit.yaml", FitYaml("two", Line));

        var run = cli.Run("check", spec);

        Assert.True(run.ExitCode == 2, run.ToString());
        var located = run.StderrLines.Select(l => CliSpecs.DataError().Match(l)).Where(m => m.Success)
            .Select(m => $"{m.Groups["line"].Value}:{m.Groups["column"].Value}").ToList();
        Assert.Equal(["3:x", "6:y"], located);
    }

    /// <summary>A column the model does not use may hold anything: it is not read into the fit.</summary>
    [Fact]
    public void Non_finite_values_in_an_unused_column_do_not_stop_the_fit()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", Csv("x,y,note", Rows.Select((r, i) => r + (i % 2 == 0 ? ",nan" : ",inf"))));
        var spec = cli.Write("unused.fit.yaml", FitYaml("unused", Line));

        var run = cli.Run("solve", spec, "--out", "out", "--format", "json");

        Assert.True(run.ExitCode == 0, run.ToString());
        Assert.Equal("optimal", Status(cli, "unused"));
        Assert.Equal(6, Result(cli, "unused").GetProperty("data").GetProperty("used").GetInt32());
    }

    /// <summary>With `data.missing: drop` a non-finite cell drops its row, which the result counts.</summary>
    [Fact]
    public void Missing_drop_leaves_out_and_counts_rows_with_non_finite_cells()
    {
        using var cli = new CliHarness();
        var rows = Rows.ToArray();
        rows[0] = "1,-inf";
        rows[3] = "NaN,7.8";
        cli.Write("d.csv", Csv(Header, rows));
        var spec = cli.Write("dropped.fit.yaml", FitYaml("dropped", Line, dataExtra: "  missing: drop\n"));

        var run = cli.Run("solve", spec, "--out", "out", "--format", "json");

        Assert.True(run.ExitCode == 0, run.ToString());
        var data = Result(cli, "dropped").GetProperty("data");
        Assert.Equal(6, data.GetProperty("rows").GetInt32());
        Assert.Equal(4, data.GetProperty("used").GetInt32());
        Assert.Equal(2, data.GetProperty("dropped_missing").GetInt32());
    }

    /// <summary>Every case of <see cref="Cells"/>, solved in one run.</summary>
    public sealed class Batch() : CaseBatch(Cells.Select(c => new EdgeCase((string)c[0], FitYaml((string)c[0], Line), SampleWith((string)c[1], 4, (string)c[2]))));
}
