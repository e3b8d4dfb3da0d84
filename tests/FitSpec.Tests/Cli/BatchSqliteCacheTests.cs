namespace FitSpec.Tests.Cli;

/// <summary>An SQLite-sourced fit is cached like a CSV one, keyed by the database's bytes and the query.</summary>
public sealed class BatchSqliteCacheTests : IDisposable
{
    private readonly CliHarness _cli = new();

    [Fact]
    public void A_second_run_takes_an_sqlite_fit_from_the_cache_and_a_changed_query_solves_again()
    {
        var (x, y) = Data.DataFiles.Noise(30, 5);
        Data.DataFiles.WriteSqliteTable(Path.Combine(_cli.Folder, "lab.db"), "readings", ("x", x), ("y", y));
        string Spec(string where) => $"fitspec: 1\nname: lab\ndata: {{sqlite: lab.db, query: \"SELECT x, y FROM readings{where}\"}}\nmodel:\n  response: y\n  terms: {{b0: 1, b1: x}}\nloss: l2\nreport:\n  formats: [json]\n";
        _cli.Write("lab.fit.yaml", Spec(""));
        var first = _cli.Run("solve", "lab.fit.yaml", "--out", "out");
        Assert.True(first.ExitCode == 0, first.ToString());
        Assert.Empty(BatchSpecs.Cached(first));

        var second = _cli.Run("solve", "lab.fit.yaml", "--out", "out");
        Assert.Contains("lab", BatchSpecs.Cached(second));

        _cli.Write("lab.fit.yaml", Spec(" WHERE x > 0.1"));
        var third = _cli.Run("solve", "lab.fit.yaml", "--out", "out");
        Assert.Empty(BatchSpecs.Cached(third));
    }

    public void Dispose() => _cli.Dispose();
}
