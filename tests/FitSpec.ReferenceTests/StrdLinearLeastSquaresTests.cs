using System.Globalization;
using System.Text;
using FitSpec.ReferenceTests.Support;
using Xunit.Abstractions;

namespace FitSpec.ReferenceTests;

/// <summary>
/// NIST StRD Linear Least Squares (itl.nist.gov/div898/strd/lls): every certified coefficient reproduced
/// through the whole pipeline (spec file → result.json) to a log relative error of at least 9.
/// Certified values are read from the reference folder's JSON (source named inside each file).
/// </summary>
public sealed class StrdLinearLeastSquaresTests
{
    private static readonly string[] Datasets =
        ["Norris", "Pontius", "NoInt1", "NoInt2", "Filip", "Longley", "Wampler1", "Wampler2", "Wampler3", "Wampler4", "Wampler5"];

    private readonly ITestOutputHelper _output;

    public StrdLinearLeastSquaresTests(ITestOutputHelper output) => _output = output;

    [ReferenceFact]
    public void Every_certified_coefficient_has_LRE_of_at_least_9()
    {
        var table = new StringBuilder();
        table.AppendLine("| dataset | parameters | min LRE | LRE per coefficient |");
        table.AppendLine("| --- | ---: | ---: | --- |");
        var failures = new List<string>();
        foreach (var name in Datasets)
        {
            var (certified, result) = Solve(name);
            var coefficients = result.GetProperty("coefficients");
            var lres = new List<double>();
            foreach (var p in certified.GetProperty("parameters").EnumerateArray())
            {
                var pname = p.GetProperty("name").GetString()!;
                var cert = ReferenceData.Number(p.GetProperty("estimate"));
                var est = coefficients.GetProperty(pname).GetDouble();
                var lre = Lre.Of(est, cert);
                lres.Add(lre);
                if (lre < 9)
                {
                    failures.Add($"{name} {pname}: estimate {est:R}, certified {cert:R}, LRE {lre:F2}");
                }
            }

            table.AppendLine(CultureInfo.InvariantCulture, $"| {name} | {lres.Count} | {lres.Min():F1} | {string.Join(" ", lres.Select(l => l.ToString("F1", CultureInfo.InvariantCulture)))} |");
        }

        _output.WriteLine("NIST StRD linear least squares, log relative error of each certified coefficient:");
        _output.WriteLine(table.ToString());
        Console.WriteLine(table.ToString());
        Assert.True(failures.Count == 0, string.Join(Environment.NewLine, failures));
    }

    /// <summary>
    /// The classical standard errors of the unconstrained l2 fit against the certified standard deviations of the
    /// estimates (same NIST StRD files, "std_dev"), and residual_sd against the certified residual standard deviation.
    /// </summary>
    [ReferenceFact]
    public void Every_certified_standard_deviation_has_LRE_of_at_least_8()
    {
        var table = new StringBuilder();
        table.AppendLine("| dataset | min LRE of std devs | residual sd LRE |");
        table.AppendLine("| --- | ---: | ---: |");
        var failures = new List<string>();
        foreach (var name in Datasets)
        {
            var (certified, result) = Solve(name);
            var errors = result.GetProperty("uncertainty").GetProperty("standard_errors").EnumerateArray()
                .ToDictionary(e => e.GetProperty("name").GetString()!, e => e.GetProperty("std_error").GetDouble());
            var lres = new List<double>();
            foreach (var p in certified.GetProperty("parameters").EnumerateArray())
            {
                var pname = p.GetProperty("name").GetString()!;
                var cert = ReferenceData.Number(p.GetProperty("std_dev"));
                var lre = Lre.Of(errors[pname], cert);
                lres.Add(lre);
                if (lre < 8)
                {
                    failures.Add($"{name} {pname}: std error {errors[pname]:R}, certified {cert:R}, LRE {lre:F2}");
                }
            }

            var sdCert = ReferenceData.Number(certified.GetProperty("residual_std_dev"));
            var sdLre = Lre.Of(result.GetProperty("metrics").GetProperty("residual_sd").GetDouble(), sdCert);
            if (sdLre < 8)
            {
                failures.Add($"{name} residual sd: LRE {sdLre:F2}");
            }

            table.AppendLine(CultureInfo.InvariantCulture, $"| {name} | {lres.Min():F1} | {sdLre:F1} |");
        }

        _output.WriteLine("NIST StRD linear least squares, log relative error of each certified standard deviation:");
        _output.WriteLine(table.ToString());
        Console.WriteLine(table.ToString());
        Assert.True(failures.Count == 0, string.Join(Environment.NewLine, failures));
    }

    private static (System.Text.Json.JsonElement Certified, System.Text.Json.JsonElement Result) Solve(string name)
    {
        var certified = ReferenceData.Json($"strd-lls/{name}.json");
        using var ws = new SpecWorkspace();
        var data = ws.CopyData($"strd-lls/{name}.csv");
        var spec = ws.WriteSpec(name.ToLowerInvariant(), SpecFor(name, data, certified.GetProperty("parameters").GetArrayLength()));
        var result = ws.Solve(spec);
        Assert.True(result.GetProperty("status").GetString() == "optimal", $"{name}: {result}");
        return (certified, result);
    }

    private static string SpecFor(string name, string dataFile, int parameters)
    {
        var terms = name switch
        {
            "Norris" => "B0: 1\n    B1: x",
            "NoInt1" or "NoInt2" => "B1: x",
            "Longley" => "B0: 1\n    B1: x1\n    B2: x2\n    B3: x3\n    B4: x4\n    B5: x5\n    B6: x6",
            _ => $"B0: 1\n    B: {{polynomial: x, degree: {parameters - 1}}}",
        };
        return $"""
            fitspec: 1
            name: strd-{name.ToLowerInvariant()}
            data:
              path: {dataFile}
            model:
              response: y
              terms:
                {terms}
            loss: l2
            report:
              formats: [json]
            """;
    }
}
