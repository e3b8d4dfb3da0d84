using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.RegularExpressions;
using Xunit.Abstractions;

namespace FitSpec.ReferenceTests.Support;

/// <summary>
/// Collects FitSpec-versus-reference comparisons (each with the reference's source), prints them as a table
/// and fails once, at the end, listing every comparison outside its tolerance.
/// </summary>
public sealed partial class AgreementTable
{
    private readonly List<Row> _rows = [];
    private readonly List<string> _failures = [];
    private readonly SortedDictionary<string, string> _sources = new(StringComparer.Ordinal);

    /// <summary>Records where a reference file's values come from (its <c>source</c> field).</summary>
    public string Source(string referenceFile)
    {
        var source = ReferenceData.Json(referenceFile).GetProperty("source").GetString()!;
        _sources[referenceFile] = source;
        return referenceFile;
    }

    /// <summary>|a - r| / |r| (|a - r| when r = 0).</summary>
    public void Relative(string caseName, string quantity, double actual, double reference, double tolerance, string referenceFile) =>
        Add(caseName, quantity, actual, reference, reference == 0 ? Math.Abs(actual - reference) : Math.Abs(actual - reference) / Math.Abs(reference), "relative", tolerance, referenceFile);

    /// <summary>|a - r| / max(1, |r|).</summary>
    public void Scaled(string caseName, string quantity, double actual, double reference, double tolerance, string referenceFile) =>
        Add(caseName, quantity, actual, reference, Math.Abs(actual - reference) / Math.Max(1, Math.Abs(reference)), "abs / max(1, abs ref)", tolerance, referenceFile);

    /// <summary>|a - r|.</summary>
    public void Absolute(string caseName, string quantity, double actual, double reference, double tolerance, string referenceFile) =>
        Add(caseName, quantity, actual, reference, Math.Abs(actual - reference), "absolute", tolerance, referenceFile);

    /// <summary>a == r exactly (as doubles).</summary>
    public void Exact(string caseName, string quantity, double actual, double reference, string referenceFile)
    {
        var diff = Math.Abs(actual - reference);
        _rows.Add(new Row(caseName, quantity, actual, reference, diff, "exact", 0, actual.Equals(reference)));
        if (!actual.Equals(reference))
        {
            _failures.Add($"{caseName} {quantity}: fitspec {actual:R}, reference {reference:R} ({referenceFile}), must be exactly equal");
        }
    }

    /// <summary>A yes/no requirement (status, verification) that is not a number.</summary>
    public void Require(string caseName, string what, bool ok, string detail)
    {
        if (!ok)
        {
            _failures.Add($"{caseName}: {what}: {detail}");
        }
    }

    public void WriteTo(ITestOutputHelper output, string title)
    {
        var text = new StringBuilder();
        text.AppendLine(title);
        text.AppendLine("| case | quantity | value | reference value | difference | measure | tolerance | ok |");
        text.AppendLine("| --- | --- | ---: | ---: | ---: | --- | ---: | --- |");
        foreach (var r in _rows)
        {
            text.AppendLine(CultureInfo.InvariantCulture,
                $"| {r.Case} | {r.Quantity} | {r.Actual:G15} | {r.Reference:G15} | {r.Difference:0.0E+00} | {r.Measure} | {(r.Measure == "exact" ? "0" : r.Tolerance.ToString("0E+0", CultureInfo.InvariantCulture))} | {(r.Ok ? "yes" : "NO")} |");
        }

        text.AppendLine();
        text.AppendLine("Reference sources:");
        foreach (var (file, source) in _sources)
        {
            text.AppendLine(CultureInfo.InvariantCulture, $"- {file}: {source}");
        }

        output.WriteLine(text.ToString());
    }

    public void AssertAll() => Assert.True(_failures.Count == 0, string.Join(Environment.NewLine, _failures));

    /// <summary>The tolerance a reference file's <c>tolerance_hint</c> states (its first number such as 1e-9), checking the hint's wording.</summary>
    public static double HintTolerance(JsonElement reference, string key, string mustMention)
    {
        var hint = reference.GetProperty("tolerance_hint").GetProperty(key).GetString()!;
        Assert.True(hint.Contains(mustMention, StringComparison.Ordinal), $"tolerance_hint.{key} is \"{hint}\"; expected it to mention \"{mustMention}\"");
        var m = ScientificNumber().Match(hint);
        Assert.True(m.Success, $"no tolerance number in tolerance_hint.{key}: \"{hint}\"");
        return double.Parse(m.Value, NumberStyles.Float, CultureInfo.InvariantCulture);
    }

    private void Add(string caseName, string quantity, double actual, double reference, double diff, string measure, double tolerance, string referenceFile)
    {
        var ok = diff <= tolerance;
        _rows.Add(new Row(caseName, quantity, actual, reference, diff, measure, tolerance, ok));
        if (!ok)
        {
            _failures.Add(string.Create(CultureInfo.InvariantCulture,
                $"{caseName} {quantity}: fitspec {actual:R}, reference {reference:R} ({referenceFile}), {measure} difference {diff:E3} > {tolerance:E0}"));
        }
    }

    [GeneratedRegex(@"\d+(\.\d+)?[eE][-+]?\d+")]
    private static partial Regex ScientificNumber();

    private sealed record Row(string Case, string Quantity, double Actual, double Reference, double Difference, string Measure, double Tolerance, bool Ok);
}
