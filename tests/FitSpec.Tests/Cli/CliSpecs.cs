using System.Text.RegularExpressions;

namespace FitSpec.Tests.Cli;

/// <summary>Small specs and data for the CLI tests, and the error-line formats the spec language prescribes.</summary>
public static partial class CliSpecs
{
    /// <summary>y ≈ 2x, six rows; lines 2..7 of the file.</summary>
    public const string SampleData = "x,y\n1,2.1\n2,3.9\n3,6.2\n4,7.8\n5,10.1\n6,12.2\n";

    /// <summary>y ~ b0 + b1·x with l2, plus <paramref name="tail"/> (top-level YAML) and <paramref name="dataExtra"/> (keys under data:).</summary>
    public static string Linear(string name, string dataPath = "d.csv", string tail = "", string dataExtra = "", string b1 = "x") =>
        $"fitspec: 1\nname: {name}\ndata:\n  path: {dataPath}\n{dataExtra}model:\n  response: y\n  terms:\n    b0: 1\n    b1: {b1}\nloss: l2\n{tail}";

    /// <summary>1-based line and column of the first occurrence of <paramref name="needle"/>.</summary>
    public static (int Line, int Column) Locate(string text, string needle)
    {
        var at = text.IndexOf(needle, StringComparison.Ordinal);
        Assert.True(at >= 0, $"'{needle}' not in the text");
        var line = text[..at].Count(c => c == '\n') + 1;
        var lineStart = at == 0 ? 0 : text.LastIndexOf('\n', at - 1) + 1;
        return (line, at - lineStart + 1);
    }

    /// <summary>FILE:LINE:COLUMN: error: message (spec errors).</summary>
    [GeneratedRegex(@"^(?<file>.+?):(?<line>\d+):(?<col>\d+): error: (?<msg>.+)$")]
    public static partial Regex SpecError();

    /// <summary>DATAFILE:LINE: error: column 'name': message (data errors).</summary>
    [GeneratedRegex(@"^(?<file>.+?):(?<line>\d+): error: column '(?<column>[^']+)': (?<msg>.+)$")]
    public static partial Regex DataError();

    /// <summary>The single stderr line matching <paramref name="format"/>; fails when there is none or several.</summary>
    public static Match SingleError(CliRun run, Regex format)
    {
        var matches = run.StderrLines.Select(l => format.Match(l)).Where(m => m.Success).ToList();
        Assert.True(matches.Count == 1, $"expected exactly one error line of the form {format}: {run}");
        return matches[0];
    }
}
