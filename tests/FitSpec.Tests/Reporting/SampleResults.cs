using FitSpec.Lowering;
using FitSpec.Results;
using FitSpec.Verification;

namespace FitSpec.Tests.Reporting;

/// <summary>
/// Hand-built results covering the report's sections, so rendering is tested without solving. The numbers are
/// made up to exercise formatting; they are not check values and have no source to name.
/// </summary>
internal static class SampleResults
{
    public const string Attack = "<script>alert(1)</script>";

    public static FitResult Optimal(string? title = "Thermistor calibration", string? description = "Bench run 7.\nReference: PRT #12.",
        string coefficientName = "a1", string constraintLabel = "f(25) == 10000") => new(
        Name: "thermistor",
        Status: "optimal",
        StatusDetail: null,
        SpecFile: "specs/thermistor.fit.yaml",
        Title: title,
        Description: description,
        Statement: new FitStatement(
            "resistance",
            "f = a0·1 + a1·t + a2·t^2",
            "l1",
            "minimise Σ |e_i| with e_i = y_i − f(x_i)",
            ["0.5 · Σ b_j² over a1, a2"],
            [constraintLabel, "f increasing on t in [0, 50]"],
            "w",
            "t > -10"),
        Problem: new ProblemInfo("LP", 7, 12, 40, "HiGHS 1.12.0", "simplex", "epigraph of |e|", 0.0125, 9),
        Objective: 1.2345678901234,
        Coefficients:
        [
            new CoefficientValue("a0", 9876.54321012345, "constant"),
            new CoefficientValue(coefficientName, -0.000123456789012345, "t"),
            new CoefficientValue("a2", 0.0, "t^2"),
        ],
        Data: new DataInfo("data/run7.csv", new string('d', 64), 25, 20, 3, 2),
        Metrics: new Metrics(20, 0.0421, 0.0333, 0.1234567, 0.999912345678, 0.044),
        Constraints:
        [
            new ConstraintCheck(1, constraintLabel, "value", true, -3.25, 0.0, 0.0, null, null, null),
            new ConstraintCheck(2, "f increasing on t in [0, 50]", "shape", false, 0.0, 0.0, 0.02, "51 points on [0, 50]", 1.5e-12, 501),
        ],
        Acceptance:
        [
            new AcceptanceResult("rmse < 0.05", 0.0421, true, null),
            new AcceptanceResult("max_abs_residual <= 0.1", 0.1234567, false, null),
        ],
        Verification: new Verification.Verification(1.2345678901234, 1.2345678901236, 1.6e-13, 2e-15, 1.2345678901, 3.1e-11, 4e-10, null, true, []),
        LargestResiduals:
        [
            new LargestResidual(4, 6, 10.5, 10.3765433, 0.1234567),
            new LargestResidual(11, 13, 9.9, 9.95, -0.05),
        ],
        Lowering:
        [
            new LoweringNote("loss", "l1", "one epigraph variable per row"),
            new LoweringNote("constraint", constraintLabel, "equality row on the coefficients"),
        ],
        Provenance: new Provenance(new string('a', 64), new string('d', 64), "0.1.0", "HiGHS 1.12.0", ".NET 10.0.0", "Linux"),
        Errors: []);

    public static FitResult Invalid() => new(
        Name: "broken",
        Status: "error",
        StatusDetail: "the spec or its data is invalid; nothing was solved",
        SpecFile: "specs/broken.fit.yaml",
        Title: "Broken spec",
        Description: null,
        Statement: null,
        Problem: null,
        Objective: null,
        Coefficients: [],
        Data: null,
        Metrics: null,
        Constraints: [],
        Acceptance: [],
        Verification: null,
        LargestResiduals: [],
        Lowering: [],
        Provenance: new Provenance(new string('b', 64), null, "0.1.0", "HiGHS 1.12.0", ".NET 10.0.0", "Linux"),
        Errors:
        [
            new ErrorEntry("specs/broken.fit.yaml", 12, 7, "model.terms.x2", "unknown column 'tempp' (did you mean 'temp'?)"),
            new ErrorEntry("data/run7.csv", 40, null, null, "value 'abc' is not a number"),
        ]);

    /// <summary>A fit that produced no point: the statement and lowering exist, nothing else.</summary>
    public static FitResult Infeasible()
    {
        var optimal = Optimal();
        return optimal with
        {
            Status = "infeasible",
            StatusDetail = "the constraints contradict each other",
            Objective = null,
            Coefficients = [],
            Metrics = null,
            Constraints = [],
            Acceptance = [],
            Verification = null,
            LargestResiduals = [],
        };
    }
}
