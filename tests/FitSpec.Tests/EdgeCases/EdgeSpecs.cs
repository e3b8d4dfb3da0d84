using System.Globalization;
using System.Text.Json;
using System.Text.RegularExpressions;
using FitSpec.Tests.Cli;

namespace FitSpec.Tests.EdgeCases;

/// <summary>Specs, data and located-error checks shared by the edge-case tests.</summary>
public static class EdgeSpecs
{
    /// <summary>y ≈ 2x, six rows on file lines 2..7 (the header is line 1).</summary>
    public const string Header = "x,y";

    public static readonly string[] Rows = ["1,2.1", "2,3.9", "3,6.2", "4,7.8", "5,10.1", "6,12.2"];

    /// <summary>The intercept-and-slope terms most cases use.</summary>
    public static readonly string[] Line = ["b0: 1", "b1: x"];

    /// <summary>A spec with response y; <paramref name="terms"/> are `key: basis` lines; the tail is top-level YAML.</summary>
    public static string FitYaml(string name, string[] terms, string loss = "l2", string data = "d.csv", string dataExtra = "", string tail = "") =>
        $"fitspec: 1\nname: {name}\ndata:\n  path: {data}\n{dataExtra}model:\n  response: y\n  terms:\n"
        + string.Concat(terms.Select(t => "    " + t + "\n"))
        + $"loss: {loss}\n{tail}";

    /// <summary>One constraint on b1, as YAML for the spec's tail.</summary>
    public const string PositiveSlope = "constraints:\n  - \"b1 >= 0\"\n";

    public static string Csv(string header, IEnumerable<string> rows) => header + "\n" + string.Join('\n', rows) + "\n";

    /// <summary>The sample data with the cell of <paramref name="column"/> on file line <paramref name="line"/> replaced.</summary>
    public static string SampleWith(string column, int line, string text)
    {
        var rows = Rows.ToArray();
        var cells = rows[line - 2].Split(',');
        cells[column == "x" ? 0 : 1] = text;
        rows[line - 2] = string.Join(',', cells);
        return Csv(Header, rows);
    }

    /// <summary>The one `DATAFILE:LINE: error: column 'name': message` line; checks its file and line.</summary>
    public static Match DataErrorAt(CliRun run, string file, int line)
    {
        var error = CliSpecs.SingleError(run, CliSpecs.DataError());
        Assert.True(error.Groups["file"].Value == file && error.Groups["line"].Value == line.ToString(CultureInfo.InvariantCulture),
            $"expected the error at {file}:{line}: {run}");
        return error;
    }

    /// <summary>The one `FILE:LINE:COLUMN: error: message` line; checks it points at line and column.</summary>
    public static Match SpecErrorAt(CliRun run, string file, (int Line, int Column) at)
    {
        var error = CliSpecs.SingleError(run, CliSpecs.SpecError());
        Assert.True($"{error.Groups["file"].Value}:{error.Groups["line"].Value}:{error.Groups["col"].Value}" == $"{file}:{at.Line}:{at.Column}",
            $"expected the error at {file}:{at.Line}:{at.Column}: {run}");
        return error;
    }

    /// <summary>1-based line and column of the <paramref name="occurrence"/>-th key <paramref name="key"/> written as `key:` at the start of a line.</summary>
    public static (int Line, int Column) KeyOf(string yaml, string key, int occurrence = 1)
    {
        var matches = Regex.Matches(yaml, $@"^( *){Regex.Escape(key)}:", RegexOptions.Multiline);
        Assert.True(matches.Count >= occurrence, $"no key '{key}' (occurrence {occurrence}) in the spec");
        var match = matches[occurrence - 1];
        return (yaml[..match.Index].Count(c => c == '\n') + 1, match.Groups[1].Length + 1);
    }

    public static JsonElement Result(CliHarness cli, string name) => cli.Json($"out/{name}.result.json");

    public static string Status(CliHarness cli, string name) => Result(cli, name).GetProperty("status").GetString()!;
}
