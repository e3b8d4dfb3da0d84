using FitSpec.Tests.Cli;
using static FitSpec.Tests.EdgeCases.EdgeSpecs;

namespace FitSpec.Tests.EdgeCases;

/// <summary>
/// `report.templates` naming a folder that does not exist makes the spec invalid: an error at that key, exit 2, and
/// (SPEC.md) a `status: error` result in place of the earlier run's, so no stale report of the old spec stays behind.
/// </summary>
public sealed class TemplateFolderTests
{
    [Fact]
    public void Missing_template_folder_is_a_spec_error_at_its_key_and_replaces_the_earlier_result()
    {
        using var cli = new CliHarness();
        cli.Write("d.csv", Csv(Header, Rows));
        var spec = cli.Write("styled.fit.yaml", FitYaml("styled", Line));
        var first = cli.Run("solve", spec, "--out", "out", "--format", "json");
        Assert.True(first.ExitCode == 0, first.ToString());

        var yaml = FitYaml("styled", Line, tail: "report:\n  templates: no-such-folder\n");
        cli.Write("styled.fit.yaml", yaml);
        var second = cli.Run("solve", spec, "--out", "out", "--format", "md,json");

        Assert.True(second.ExitCode == 2, second.ToString());
        var error = CliSpecs.SingleError(second, CliSpecs.SpecError());
        Assert.True(error.Groups["file"].Value == spec && int.Parse(error.Groups["line"].Value, System.Globalization.CultureInfo.InvariantCulture) == KeyOf(yaml, "templates").Line,
            $"expected the error on the line of 'templates:' ({KeyOf(yaml, "templates").Line}): {second}");
        Assert.Contains("no-such-folder", error.Groups["msg"].Value, StringComparison.Ordinal);
        Assert.Equal("error", Status(cli, "styled"));
    }
}
