using System.Text.Json;

namespace FitSpec.ReferenceTests.Support;

/// <summary>
/// Specs, in the spec language's documented forms, for the published worked examples
/// (reference folder <c>published/</c>), and small helpers to read a result.json.
/// </summary>
public static class PublishedSpecs
{
    /// <summary>The coefficient name the specs below give the constant term.</summary>
    public const string Intercept = "intercept";

    /// <summary>Reference files call the constant term "(Intercept)"; the specs name every other coefficient after its column.</summary>
    public static string CoefficientName(string referenceName) => referenceName == "(Intercept)" ? Intercept : referenceName;

    /// <summary>stack_loss ~ [1 +] air_flow + water_temp + acid_conc.</summary>
    public static string Stackloss(string name, string dataFile, string loss, bool intercept = true, string constraints = "")
    {
        var constant = intercept ? $"{Intercept}: 1\n    " : "";
        return $"""
            fitspec: 1
            name: {name}
            data:
              path: {dataFile}
            model:
              response: stack_loss
              terms:
                {constant}air_flow: air_flow
                water_temp: water_temp
                acid_conc: acid_conc
            loss: {loss}
            {constraints}
            report:
              formats: [json]
            """;
    }

    /// <summary>foodexp ~ 1 + income.</summary>
    public static string Engel(string name, string dataFile, string loss) => $"""
        fitspec: 1
        name: {name}
        data:
          path: {dataFile}
        model:
          response: foodexp
          terms:
            {Intercept}: 1
            income: income
        loss: {loss}
        report:
          formats: [json]
        """;

    /// <summary>The quantile loss in the spec language, tau written exactly as the reference file gives it.</summary>
    public static string QuantileLoss(string tau) => $"{{kind: quantile, tau: {tau}}}";

    public static string Status(JsonElement result) => result.GetProperty("status").GetString()!;

    public static double Objective(JsonElement result) => result.GetProperty("objective").GetDouble();

    public static bool VerificationPassed(JsonElement result) =>
        result.TryGetProperty("verification", out var v) && v.ValueKind == JsonValueKind.Object
        && v.TryGetProperty("passed", out var p) && p.ValueKind == JsonValueKind.True;

    public static string ProblemClass(JsonElement result) =>
        result.TryGetProperty("problem", out var p) && p.ValueKind == JsonValueKind.Object ? p.GetProperty("class").GetString()! : "(none)";

    /// <summary>Status optimal, verification passed and the problem class the spec's loss table names.</summary>
    public static void RequireSolved(AgreementTable table, string caseName, JsonElement result, string expectedClass)
    {
        table.Require(caseName, "status", Status(result) == "optimal", $"status '{Status(result)}', expected 'optimal': {result}");
        table.Require(caseName, "verification.passed", VerificationPassed(result), "verification did not pass: " + (result.TryGetProperty("verification", out var v) ? v.ToString() : "(none)"));
        table.Require(caseName, "problem.class", ProblemClass(result) == expectedClass, $"problem.class '{ProblemClass(result)}', expected '{expectedClass}'");
    }

    /// <summary>Compares each reference coefficient with the result's, as |b - ref| / max(1, |ref|).</summary>
    public static void CompareCoefficients(AgreementTable table, string caseName, JsonElement result, JsonElement referenceCoefficients, double tolerance, string referenceFile)
    {
        var coefficients = result.GetProperty("coefficients");
        foreach (var c in referenceCoefficients.EnumerateObject())
        {
            var name = CoefficientName(c.Name);
            if (!coefficients.TryGetProperty(name, out var value) || value.ValueKind != JsonValueKind.Number)
            {
                table.Require(caseName, name, false, $"coefficient '{name}' missing from the result: {coefficients}");
                continue;
            }

            // max(1, |ref|) makes this an absolute comparison for the reference's exact zeros.
            table.Scaled(caseName, name, value.GetDouble(), ReferenceData.Number(c.Value), tolerance, referenceFile);
        }
    }
}
