using System.Globalization;
using System.Reflection;
using System.Runtime.InteropServices;
using System.Security.Cryptography;
using FitSpec.Analysis.Conflicts;
using FitSpec.Data;
using FitSpec.Design;
using FitSpec.Diagnostics;
using FitSpec.Lowering;
using FitSpec.Results;
using FitSpec.Solving;
using FitSpec.Spec;
using FitSpec.Verification;

namespace FitSpec.Pipeline;

/// <summary>A fit's result and how its reports are to be written.</summary>
public sealed record FitOutcome(FitResult Result, IReadOnlyList<ReportFormat> Formats, string? TemplateFolder);

/// <summary>Runs one spec through every stage and returns its result; user errors become an error result.</summary>
public static class FitRunner
{
    public static string ToolVersion =>
        typeof(FitRunner).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion ?? "0.0.0";

    private static readonly ReportFormat[] AllFormats = [ReportFormat.Html, ReportFormat.Md, ReportFormat.Json];

    public static FitOutcome RunForOutput(string specPath, CancellationToken cancellation = default) =>
        RunForOutput(specPath, RunSettings.Default, cancellation);

    public static FitOutcome RunForOutput(string specPath, RunSettings settings, CancellationToken cancellation = default) =>
        RunForOutput(specPath, SpecReader.Read(specPath), settings, cancellation);

    /// <summary>Runs a spec already read (a batch reads each spec once, for its cache key and for the run).</summary>
    public static FitOutcome RunForOutput(string specPath, SpecReadResult read, RunSettings settings, CancellationToken cancellation = default)
    {
        ArgumentNullException.ThrowIfNull(specPath);
        ArgumentNullException.ThrowIfNull(read);
        ArgumentNullException.ThrowIfNull(settings);
        read = PathConfinement.Apply(read, settings.AllowOutsidePaths);
        FitResult result;
        FitSpecDocument? spec = null;
        try
        {
            result = Run(specPath, read, settings, out spec, cancellation);
        }
        catch (Exception e) when (e is not OperationCanceledException)
        {
            // A bug must not take down a batch or print a stack trace: the fit gets an error result that says so.
            var sha = Convert.ToHexStringLower(SHA256.HashData(read.Bytes));
            result = Failed(read.Name, specPath, read.Document, MakeProvenance(sha, null, settings), null, [new Diagnostic(specPath, null, null, null, $"internal error ({e.GetType().Name}: {e.Message}); this is a bug in FitSpec, please report it with the spec and data")]);
        }

        var templates = spec?.Report.Templates is { } t ? Path.Combine(spec.Folder, t.Value) : null;
        return new FitOutcome(result, spec?.Report.Formats ?? AllFormats, templates);
    }

    public static FitResult Run(string specPath, CancellationToken cancellation = default) =>
        Run(specPath, PathConfinement.Apply(SpecReader.Read(specPath), allowOutside: false), RunSettings.Default, out _, cancellation);

    private static FitResult Run(string specPath, SpecReadResult read, RunSettings settings, out FitSpecDocument? document, CancellationToken cancellation)
    {
        ArgumentNullException.ThrowIfNull(specPath);
        document = null;
        var specSha = Convert.ToHexStringLower(SHA256.HashData(read.Bytes));
        if (read.Document is not { } spec)
        {
            return Failed(read.Name, specPath, null, MakeProvenance(specSha, null, settings), null, read.Errors);
        }

        document = spec;

        Table? table = null;
        try
        {
            var acceptErrors = Acceptance.Validate(spec.Report.Accept).Concat(TemplateFolderCheck.Check(spec, ref document)).ToList();
            if (acceptErrors.Count > 0)
            {
                throw new FitSpecException(acceptErrors);
            }

            var model = ModelCompiler.Compile(spec);
            table = TableLoader.Load(spec, new DataRequest(model.ColumnsToRead, model.Filter?.Root));
            var design = DesignBuilder.Build(spec, model, table);
            var nameErrors = Acceptance.CheckNames(spec.Report.Accept, design.Coefficients.Select(c => c.Name)).ToList();
            if (nameErrors.Count > 0)
            {
                throw new FitSpecException(nameErrors);
            }

            var lowered = FitLowering.Lower(spec, design);
            var options = new SolveOptions(spec.Solve.Method, spec.Solve.TimeLimit, (Formulation)(int)spec.Solve.Form);
            var solution = Solver.Solve(lowered, options, cancellation);
            return Assemble(spec, MakeProvenance(specSha, table.Sha256, settings), table, lowered, solution, options, cancellation);
        }
        catch (FitSpecException e)
        {
            return Failed(spec.Name, specPath, spec, MakeProvenance(specSha, table?.Sha256, settings), table, e.Diagnostics);
        }
    }

    /// <summary>Lowers a spec without solving (for check and export).</summary>
    public static LoweredFit Lower(FitSpecDocument spec, bool forceProgram)
    {
        ArgumentNullException.ThrowIfNull(spec);
        var model = ModelCompiler.Compile(spec);
        var table = TableLoader.Load(spec, new DataRequest(model.ColumnsToRead, model.Filter?.Root));
        var design = DesignBuilder.Build(spec, model, table);
        return FitLowering.Lower(spec, design, forceProgram);
    }

    private static FitResult Assemble(FitSpecDocument spec, Provenance provenance, Table table, LoweredFit lowered, Solution solution, SolveOptions options, CancellationToken cancellation)
    {
        var design = lowered.Design;
        var program = lowered.Program;
        var isClosed = lowered.Class == ProblemClass.ClosedForm;
        var problem = new ProblemInfo(
            ClassName(lowered.Class),
            isClosed ? design.P : program.NumVars,
            isClosed ? design.Rows + (lowered.ClosedForm?.RidgeRows.Count ?? 0) : program.NumRows,
            isClosed ? design.Rows * design.P : program.NonZeros,
            solution.Solver, solution.Method, solution.Formulation, solution.Seconds, solution.Iterations)
        { MipGap = solution.MipGap };
        var data = DataOf(table);
        var statement = Statement.Describe(spec, design, lowered.PenaltyTargets);

        if (solution.X is null)
        {
            var diagnosis = NoSolutionDiagnosis.Of(lowered, solution, cancellation);
            return new FitResult(spec.Name, StatusName(diagnosis.Status), diagnosis.Detail, spec.File, spec.Title, spec.Description, statement, problem, null, [], data, null, [], [], null, [], [.. lowered.Notes, .. solution.Notes], provenance, [])
            {
                Conflict = diagnosis.Conflict,
                FreeDirection = diagnosis.Direction,
            };
        }

        var check = Verifier.Check(lowered, solution);
        var coefficients = design.Coefficients.Select((c, j) => new CoefficientValue(c.Name, check.Beta[j], Statement.Basis(spec, c))).ToList();
        var values = new Dictionary<string, double>(StringComparer.Ordinal)
        {
            ["rmse"] = check.Metrics.Rmse,
            ["mae"] = check.Metrics.Mae,
            ["max_abs_residual"] = check.Metrics.MaxAbsResidual,
            ["r2"] = check.Metrics.R2,
            ["objective"] = check.Objective,
            ["observations"] = check.Metrics.Observations,
            ["residual_sd"] = check.Metrics.ResidualSd ?? double.NaN,
        };
        foreach (var c in coefficients)
        {
            values[c.Name] = c.Value;
        }

        var acceptance = Acceptance.Evaluate(spec.Report.Accept, values);
        string resultStatus;
        string? statusDetail = null;
        if (!check.Verification.Passed)
        {
            resultStatus = "error";
            statusDetail = "the solution failed its own verification: " + string.Join("; ", check.Verification.Failures);
        }
        else if (solution.Status == SolveStatus.TimeLimit)
        {
            resultStatus = "time-limit";
            statusDetail = "the time limit was reached; the point shown is the best found, not a proven optimum";
        }
        else
        {
            // SPEC: a non-convex fit's point is a local optimum unless the backend proved it global.
            resultStatus = solution.Status == SolveStatus.Optimal && !solution.GlobalOptimum ? "local-optimum" : StatusName(solution.Status);
            statusDetail = solution.StatusDetail;
        }

        // SPEC: non-convex fits report no duals.
        var constraints = solution.GlobalOptimum ? check.Constraints : check.Constraints.Select(c => c with { Dual = null }).ToList();
        var result = new FitResult(
            spec.Name, resultStatus, statusDetail, spec.File, spec.Title, spec.Description, statement, problem,
            check.Objective, coefficients, data, check.Metrics, constraints, acceptance, check.Verification,
            Largest(design, check.Residuals), [.. lowered.Notes, .. solution.Notes], provenance, [])
        {
            OutlierLines = solution.Outliers?.Select(i => design.Table.Lines[i]).ToList() ?? [],
        };
        return resultStatus == "error" ? result : FitInsight.Add(result, lowered, check, options, cancellation);
    }

    private static IReadOnlyList<LargestResidual> Largest(Design.Design design, double[] e)
    {
        return Enumerable.Range(0, e.Length)
            .OrderByDescending(i => Math.Abs(e[i])).ThenBy(i => i)
            .Take(10)
            .Select(i => new LargestResidual(i + 1, design.Table.Lines[i], design.Y[i], design.Y[i] - e[i], e[i]))
            .ToList();
    }

    private static FitResult Failed(string name, string specPath, FitSpecDocument? spec, Provenance provenance, Table? table, IReadOnlyList<Diagnostic> errors)
    {
        var entries = errors.Select(d => new ErrorEntry(d.File, d.Line, d.Column, d.Field, d.Message)).ToList();
        return new FitResult(
            name, "error", "the spec or its data is invalid; nothing was solved", specPath, spec?.Title, spec?.Description,
            spec is null ? null : Statement.Describe(spec, null, null), null, null, [], table is null ? null : DataOf(table), null, [], [], null, [], [],
            provenance, entries);
    }

    private static DataInfo DataOf(Table t) => new(t.DisplayPath, t.Sha256, t.RowsRead, t.RowCount, t.DroppedMissing, t.DroppedFilter);

    private static Provenance MakeProvenance(string specSha, string? dataSha, RunSettings settings) => new(
        specSha, dataSha, ToolVersion.Split('+')[0], $"HiGHS {Solver.HighsVersion}",
        RuntimeInformation.FrameworkDescription, RuntimeInformation.OSDescription)
    {
        Commit = ToolVersion.Contains('+', StringComparison.Ordinal) ? ToolVersion[(ToolVersion.IndexOf('+', StringComparison.Ordinal) + 1)..] : null,
        CommandLine = settings.CommandLine,
        Stamp = settings.Stamp ? DateTime.UtcNow.ToString("yyyy-MM-ddTHH:mm:ssZ", CultureInfo.InvariantCulture) : null,
    };

    public static string StatusName(SolveStatus s) => s switch
    {
        SolveStatus.Optimal => "optimal",
        SolveStatus.Infeasible => "infeasible",
        SolveStatus.Unbounded => "unbounded",
        SolveStatus.TimeLimit => "time-limit",
        _ => "error",
    };

    public static string ClassName(ProblemClass c) => c switch
    {
        ProblemClass.ClosedForm => "closed-form",
        ProblemClass.QPSequence => "QP-sequence",
        ProblemClass.Local => "local",
        _ => c.ToString(),
    };

    internal static string Num(double x) => x.ToString("R", CultureInfo.InvariantCulture);
}
