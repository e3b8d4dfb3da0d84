using FitSpec.Spec.Schema;
using FitSpec.Tests.Cli;

namespace FitSpec.Tests.Spec;

public sealed class SchemaCommandTests : IDisposable
{
    private readonly CliHarness _cli = new();

    public void Dispose() => _cli.Dispose();

    [Fact]
    public void Schema_prints_the_generated_schema()
    {
        var run = _cli.Run("schema");
        Assert.Equal(0, run.ExitCode);
        Assert.Equal(SchemaGenerator.Generate(), run.Stdout);
        Assert.Equal("", run.Stderr);
    }

    [Fact]
    public void Schema_out_writes_the_file_and_nothing_else()
    {
        _cli.Write("schema/old.txt", "keep");
        var run = _cli.Run("schema", "--out", "schema/fitspec.schema.json");
        Assert.Equal(0, run.ExitCode);
        Assert.Equal("", run.Stdout);
        Assert.Equal(SchemaGenerator.Generate(), _cli.Read("schema/fitspec.schema.json"));
        Assert.Equal(["fitspec.schema.json", "old.txt"], Directory.GetFiles(Path.Combine(_cli.Folder, "schema")).Select(Path.GetFileName).Order(StringComparer.Ordinal));
    }

    [Fact]
    public void Schema_out_to_an_unwritable_place_is_a_one_line_error()
    {
        _cli.Write("blocker", "a file where a folder should be");
        var run = _cli.Run("schema", "--out", "blocker/fitspec.schema.json");
        Assert.Equal(2, run.ExitCode);
        var line = Assert.Single(run.StderrLines);
        Assert.StartsWith("blocker/fitspec.schema.json: error: cannot write the schema", line, StringComparison.Ordinal);
    }
}
