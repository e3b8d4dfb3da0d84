using FitSpec.Diagnostics;
using FitSpec.Results;
using FitSpec.Review;
using static FitSpec.Tests.Cli.CliSpecs;

namespace FitSpec.Tests.Review;

/// <summary>Reading result files: what solve wrote, tolerance of additions, and located errors for bad files.</summary>
public sealed class ResultFileTests : IDisposable
{
    private readonly ReviewWorkspace _workspace = new();
    private readonly FitResult _result;
    private readonly string _json;

    public ResultFileTests()
    {
        _workspace.Write(Path.Combine("old", "d.csv"), SampleData);
        _result = _workspace.Solve("old", "probe", Linear("probe", tail: "constraints:\n  - \"b1 <= 1.9\"\nreport:\n  accept:\n    - \"rmse <= 1\"\n    - \"b0 >= 5\"\n"));
        _json = File.ReadAllText(Path.Combine(_workspace.OldResults, "probe.result.json"));
    }

    [Fact]
    public void Reads_back_what_solve_wrote()
    {
        var s = ResultFile.Read(Path.Combine(_workspace.OldResults, "probe.result.json"));
        Assert.Equal(("probe", "optimal", "QP"), (s.Name, s.Status, s.ProblemClass));
        Assert.Equal(_result.Objective, s.Objective);
        Assert.Equal(_result.Coefficients.Select(c => (c.Name, (double?)c.Value)), s.Coefficients.Select(c => (c.Name, c.Value)));
        var metrics = s.Metrics.ToDictionary(m => m.Name, m => m.Value);
        Assert.Equal(_result.Metrics!.Rmse, metrics["rmse"]);
        Assert.Equal(_result.Metrics.R2, metrics["r2"]);
        Assert.Equal(_result.Metrics.Observations, metrics["observations"]);
        Assert.Equal(_result.Acceptance.Select(a => (a.Rule, a.Value, a.Passed)), s.Acceptance.Select(a => (a.Rule, a.Value, a.Passed)));
        Assert.Equal([true, false], s.Acceptance.Select(a => a.Passed));
        Assert.Equal(_result.Provenance.SpecSha256, s.SpecSha256);
        Assert.Equal(_result.Provenance.DataSha256, s.DataSha256);
        Assert.Matches("^[0-9a-f]{64}$", s.DataSha256);
    }

    [Fact]
    public void Unknown_keys_are_ignored_and_null_numbers_accepted()
    {
        var text = _json
            .Replace("\"fitspec\": 1,", "\"fitspec\": 1,\n  \"diagnostics\": {\"condition\": [1, 2, {\"deep\": null}]},\n  \"uncertainty\": null,", StringComparison.Ordinal)
            .Replace($"\"objective\": {Num(_result.Objective!.Value)}", "\"objective\": null", StringComparison.Ordinal)
            .Replace("\"metrics\": {", "\"metrics\": {\n    \"bands\": {\"low\": 1},\n    \"aic\": null,", StringComparison.Ordinal);
        Assert.Contains("\"objective\": null", text, StringComparison.Ordinal);
        var s = ResultFile.Parse("edited.result.json", System.Text.Encoding.UTF8.GetBytes(text));
        Assert.Null(s.Objective);
        Assert.Contains(s.Metrics, m => m.Name == "aic" && m.Value is null);
        Assert.DoesNotContain(s.Metrics, m => m.Name == "bands");
        Assert.Equal(_result.Coefficients.Count, s.Coefficients.Count);
    }

    [Fact]
    public void Malformed_json_is_reported_at_the_parsers_line_and_column()
    {
        var text = _json.Replace("\"status\": \"optimal\",", "\"status\": \"optimal\",,", StringComparison.Ordinal);
        var (line, column) = Locate(text, ",,");
        var e = Error(Write("broken.result.json", text));
        Assert.Equal(line, e.Line);
        Assert.Equal(column + 1, e.Column);
        Assert.StartsWith("not valid JSON: ", e.Message, StringComparison.Ordinal);
        Assert.DoesNotContain("LineNumber", e.Message, StringComparison.Ordinal);
        Assert.Matches(@"broken\.result\.json:\d+:\d+: error: not valid JSON", e.ToString());
    }

    [Fact]
    public void A_truncated_file_is_malformed_json_with_a_position()
    {
        var e = Error(Write("cut.result.json", _json[..(_json.Length / 2)]));
        Assert.StartsWith("not valid JSON", e.Message, StringComparison.Ordinal);
        Assert.NotNull(e.Line);
        Assert.True(e.Line > 1, e.ToString());
    }

    [Fact]
    public void Json_that_is_not_a_result_says_so()
    {
        var other = Error(Write("package.result.json", "{\n  \"name\": \"x\",\n  \"version\": \"1.0\"\n}\n"));
        Assert.Contains("not a FitSpec result", other.Message, StringComparison.Ordinal);
        Assert.Contains("'fitspec'", other.Message, StringComparison.Ordinal);
        var list = Error(Write("list.result.json", "[1, 2]"));
        Assert.Contains("not a FitSpec result: the document is a list", list.Message, StringComparison.Ordinal);
        var empty = Error(Write("empty.result.json", "\n"));
        Assert.Contains("empty", empty.Message, StringComparison.Ordinal);
        var newer = Error(Write("newer.result.json", _json.Replace("\"fitspec\": 1,", "\"fitspec\": 2,", StringComparison.Ordinal)));
        Assert.Contains("result format 2", newer.Message, StringComparison.Ordinal);
        Assert.Equal(2, newer.Line);
    }

    [Fact]
    public void A_key_of_the_wrong_kind_is_located_at_the_key()
    {
        var b1 = Num(_result.Coefficients.Single(c => c.Name == "b1").Value);
        var text = _json.Replace($"\"b1\": {b1}", "\"b1\": \"steep\"", StringComparison.Ordinal);
        Assert.NotEqual(_json, text);
        var (line, column) = Locate(text, "\"b1\": \"steep\"");
        var e = Error(Write("typed.result.json", text));
        Assert.Equal((line, column), (e.Line, e.Column));
        Assert.Equal("coefficients.b1", e.Field);
        Assert.Equal("key 'coefficients.b1': expected a number or null, found a string", e.Message);

        var rule = _json.Replace("\"passed\": false", "\"passed\": \"no\"", StringComparison.Ordinal);
        var r = Error(Write("rule.result.json", rule));
        Assert.Equal(Locate(rule, "\"passed\": \"no\"").Line, r.Line);
        Assert.Equal("acceptance[1].passed", r.Field);
        Assert.Contains("rule 'b0 >= 5'", r.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_folder_is_read_flat_and_keyed_by_fit_name()
    {
        var folder = _workspace.OldResults;
        Directory.CreateDirectory(Path.Combine(folder, "nested"));
        File.Copy(Path.Combine(folder, "probe.result.json"), Path.Combine(folder, "nested", "x.result.json"));
        File.WriteAllText(Path.Combine(folder, "probe.md"), "# not a result");
        var set = ResultFolder.Read(folder);
        Assert.Equal(["probe"], set.Fits.Keys);
        Assert.Equal(folder, set.Source);
    }

    [Fact]
    public void A_folder_reports_every_bad_file_and_a_name_held_twice()
    {
        var folder = _workspace.OldResults;
        File.WriteAllText(Path.Combine(folder, "copy.result.json"), _json);
        File.WriteAllText(Path.Combine(folder, "bad.result.json"), "{\"fitspec\": 1, \"name\": }");
        var e = Assert.Throws<FitSpecException>(() => ResultFolder.Read(folder));
        Assert.Equal(2, e.Diagnostics.Count);
        Assert.EndsWith("bad.result.json", e.Diagnostics[0].File, StringComparison.Ordinal);
        Assert.Equal(1, e.Diagnostics[0].Line);
        Assert.Contains("fit name 'probe' is also the name in", e.Diagnostics[1].Message, StringComparison.Ordinal);
    }

    [Fact]
    public void An_unreadable_path_is_an_error_not_an_exception_dump()
    {
        var e = Error(Path.Combine(_workspace.Root, "absent.result.json"));
        Assert.StartsWith("cannot read the file", e.Message, StringComparison.Ordinal);
    }

    public void Dispose() => _workspace.Dispose();

    private static string Num(double v) => v.ToString("R", System.Globalization.CultureInfo.InvariantCulture);

    private string Write(string name, string text) => _workspace.Write(name, text);

    private static Diagnostic Error(string path) => Assert.Single(Assert.Throws<FitSpecException>(() => ResultFile.Read(path)).Diagnostics);
}
