using System.Globalization;
using System.Text.Json;
using FitSpec.ReferenceTests.Support;
using Xunit.Abstractions;
using static FitSpec.ReferenceTests.Support.PublishedSpecs;

namespace FitSpec.ReferenceTests;

/// <summary>
/// nnls.json: bound-constrained least squares on stackloss — (a) non-negative least squares without an intercept,
/// (b) bounded-variable least squares with a free intercept and 0 ≤ slopes ≤ 0.7. FitSpec's objective is Σe²
/// (the file's sum_squared_residuals for (a), its objective for (b)); coefficients at a bound must be exactly the bound.
/// </summary>
public sealed class PublishedBoundedLeastSquaresTests
{
    private const string NnlsFile = "published/nnls.json";

    private readonly ITestOutputHelper _output;

    public PublishedBoundedLeastSquaresTests(ITestOutputHelper output) => _output = output;

    [ReferenceFact]
    public void Nonnegative_least_squares_without_intercept_matches_the_published_solution()
    {
        var table = new AgreementTable();
        table.Source(NnlsFile);
        var reference = ReferenceData.Json(NnlsFile);
        var nnls = reference.GetProperty("nnls");
        var objectiveTol = AgreementTable.HintTolerance(reference, "objective", "relative");
        var coefTol = AgreementTable.HintTolerance(reference, "coefficients", "max(1, |x_ref|)");
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("published/stackloss.csv");
        var spec = ws.WriteSpec("stackloss-nnls", Stackloss("stackloss-nnls", data, "l2", intercept: false, constraints: """
            constraints:
              - {kind: bounds, min: 0}
            """));
        var result = ws.Solve(spec);
        const string caseName = "nnls";
        RequireSolved(table, caseName, result, "QP");

        // The file's "objective" is the residual norm ||Ax - y||; the spec's objective is Σe².
        var objective = Objective(result);
        table.Relative(caseName, "objective Σe² vs sum_squared_residuals", objective, ReferenceData.Number(nnls.GetProperty("sum_squared_residuals")), objectiveTol, NnlsFile);
        table.Relative(caseName, "sqrt(objective) vs objective (norm)", Math.Sqrt(objective), ReferenceData.Number(nnls.GetProperty("objective")), objectiveTol, NnlsFile);
        CompareCoefficients(table, caseName, result, nnls.GetProperty("coefficients"), coefTol, NnlsFile);
        var atZero = nnls.GetProperty("coefficients_at_zero_bound").EnumerateArray().Select(e => e.GetString()!).ToList();
        Assert.NotEmpty(atZero);
        foreach (var name in atZero)
        {
            table.Exact(caseName, name + " at bound 0", result.GetProperty("coefficients").GetProperty(CoefficientName(name)).GetDouble(), 0.0, NnlsFile);
        }

        var entry = SingleConstraint(table, caseName, result);
        if (entry is { } bounds)
        {
            table.Require(caseName, "bounds constraint active", bounds.GetProperty("active").ValueKind == JsonValueKind.True, $"expected active: true, got {bounds}");

            // KKT: at the reference solution the price of the active bound is the gradient of Σe², 2·Σ x_ij e_i,
            // of each coefficient at its bound (the constraint's rows summed).
            var expected = BoundMultiplierSum(ws, data, nnls.GetProperty("coefficients"), intercept: false, atZero);
            table.Relative(caseName, "bounds dual vs KKT multiplier", Dual(bounds), expected, 1e-6, NnlsFile + " coefficients + stackloss.csv");
        }

        table.WriteTo(_output, "stackloss non-negative least squares, no intercept (objective Σe²):");
        table.AssertAll();
    }

    [ReferenceFact]
    public void Bounded_variable_least_squares_matches_the_published_solution()
    {
        var table = new AgreementTable();
        table.Source(NnlsFile);
        var reference = ReferenceData.Json(NnlsFile);
        var bvls = reference.GetProperty("bvls");
        var objectiveTol = AgreementTable.HintTolerance(reference, "objective", "relative");
        var coefTol = AgreementTable.HintTolerance(reference, "coefficients", "max(1, |x_ref|)");
        using var ws = new SpecWorkspace();
        var data = ws.CopyData("published/stackloss.csv");
        var spec = ws.WriteSpec("stackloss-bvls", Stackloss("stackloss-bvls", data, "l2", constraints: """
            constraints:
              - {kind: bounds, on: [air_flow, water_temp, acid_conc], min: 0, max: 0.7}
            """));
        var result = ws.Solve(spec);
        const string caseName = "bvls";
        RequireSolved(table, caseName, result, "QP");
        table.Relative(caseName, "objective Σe²", Objective(result), ReferenceData.Number(bvls.GetProperty("objective")), objectiveTol, NnlsFile);
        CompareCoefficients(table, caseName, result, bvls.GetProperty("coefficients"), coefTol, NnlsFile);

        // active_bounds: {"air_flow": "upper 0.7", "acid_conc": "lower 0", ...}: each exactly at its bound.
        var active = new List<string>();
        foreach (var b in bvls.GetProperty("active_bounds").EnumerateObject())
        {
            var parts = b.Value.GetString()!.Split(' ');
            var bound = double.Parse(parts[1], NumberStyles.Float, CultureInfo.InvariantCulture);
            table.Exact(caseName, $"{b.Name} at {parts[0]} bound", result.GetProperty("coefficients").GetProperty(CoefficientName(b.Name)).GetDouble(), bound, NnlsFile);
            active.Add(b.Name);
        }

        Assert.Equal(3, active.Count);
        var entry = SingleConstraint(table, caseName, result);
        if (entry is { } bounds)
        {
            table.Require(caseName, "bounds constraint active", bounds.GetProperty("active").ValueKind == JsonValueKind.True, $"expected active: true, got {bounds}");
            table.Require(caseName, "bounds constraint dual >= 0", Dual(bounds) >= 0, $"expected a dual >= 0, got {bounds}");
            var expected = BoundMultiplierSum(ws, data, bvls.GetProperty("coefficients"), intercept: true, active);
            table.Relative(caseName, "bounds dual vs KKT multipliers", Dual(bounds), expected, 1e-6, NnlsFile + " coefficients + stackloss.csv");
        }

        table.WriteTo(_output, "stackloss bounded-variable least squares, free intercept, 0 <= slopes <= 0.7 (objective Σe²):");
        table.AssertAll();
    }

    private static JsonElement? SingleConstraint(AgreementTable table, string caseName, JsonElement result)
    {
        var list = result.GetProperty("constraints");
        var ok = list.ValueKind == JsonValueKind.Array && list.GetArrayLength() == 1;
        table.Require(caseName, "constraints", ok, $"expected one constraints entry (the bounds), got {list}");
        return ok ? list[0] : null;
    }

    private static double Dual(JsonElement entry) =>
        entry.GetProperty("dual").ValueKind == JsonValueKind.Number ? entry.GetProperty("dual").GetDouble() : double.NaN;

    /// <summary>
    /// Σ over the coefficients at a bound of |∂(Σe²)/∂b_j| = |2 Σ_i x_ij e_i|, with e the residuals of the
    /// reference coefficients on the data: the KKT multipliers of the active bound rows.
    /// </summary>
    private static double BoundMultiplierSum(SpecWorkspace ws, string dataFile, JsonElement referenceCoefficients, bool intercept, IEnumerable<string> atBound)
    {
        var lines = File.ReadAllLines(Path.Combine(ws.Folder, dataFile));
        var header = lines[0].Split(',');
        var rows = lines.Skip(1).Where(l => l.Length > 0)
            .Select(l => l.Split(',').Select(v => double.Parse(v, NumberStyles.Float, CultureInfo.InvariantCulture)).ToArray())
            .ToList();
        double Column(double[] row, string name) => row[Array.IndexOf(header, name)];
        var b = referenceCoefficients.EnumerateObject().ToDictionary(p => p.Name, p => ReferenceData.Number(p.Value));
        var residuals = rows.Select(r =>
            Column(r, "stack_loss")
            - (intercept ? b["(Intercept)"] : 0)
            - b["air_flow"] * Column(r, "air_flow") - b["water_temp"] * Column(r, "water_temp") - b["acid_conc"] * Column(r, "acid_conc")).ToList();
        return atBound.Sum(name => Math.Abs(2 * rows.Select((r, i) => Column(r, name) * residuals[i]).Sum()));
    }
}
