using System.Globalization;
using System.Text.RegularExpressions;

namespace FitSpec.ReferenceTests.Support;

/// <summary>
/// GLPK's stand-alone solver (Debian package glpk-utils), used as an independent second solver for exported programs.
/// </summary>
public static partial class Glpsol
{
    public static string? Executable { get; } = ExternalProcess.OnPath("glpsol");

    public static string MissingReason => "glpsol not found on PATH (install the Debian package glpk-utils)";

    /// <summary>
    /// Solves a free-MPS file; returns glpsol's status line and the objective from its plain solution file.
    /// Without presolve an infeasible LP ends in a final simplex status (INFEASIBLE, primal status 'n') rather
    /// than the presolver's UNDEFINED.
    /// </summary>
    public static GlpsolSolution SolveFreeMps(string mpsPath, bool presolve = true)
    {
        var dir = Path.GetDirectoryName(mpsPath)!;
        var printable = Path.ChangeExtension(mpsPath, ".glpsol.txt");
        var plain = Path.ChangeExtension(mpsPath, ".glpsol.sol");
        var run = ExternalProcess.Run(
            Executable ?? throw new InvalidOperationException(MissingReason),
            dir,
            presolve ? ["--freemps", mpsPath, "-o", printable, "-w", plain] : ["--freemps", mpsPath, "--nopresol", "-o", printable, "-w", plain]);
        if (run.ExitCode != 0)
        {
            throw new InvalidOperationException($"glpsol failed on {mpsPath}: {run}");
        }

        var report = File.ReadAllText(printable);
        var status = StatusLine().Match(report);
        var printed = ObjectiveLine().Match(report);

        // The plain solution file (glpsol -w) carries the objective with 15 significant digits:
        // "s bas ROWS COLS PRIMAL_STATUS DUAL_STATUS OBJECTIVE".
        var solutionLine = File.ReadLines(plain).FirstOrDefault(l => l.StartsWith("s ", StringComparison.Ordinal))
            ?? throw new InvalidOperationException($"no solution line in {plain}");
        var fields = solutionLine.Split(' ', StringSplitOptions.RemoveEmptyEntries);
        return new GlpsolSolution(
            status.Success ? status.Groups[1].Value : "(no status line)",
            double.Parse(fields[^1], NumberStyles.Float, CultureInfo.InvariantCulture),
            printed.Success ? double.Parse(printed.Groups[1].Value, NumberStyles.Float, CultureInfo.InvariantCulture) : double.NaN,
            fields.Length > 5 ? fields[4] + "/" + fields[5] : "?");
    }

    [GeneratedRegex(@"^Status:\s+(\S+)", RegexOptions.Multiline)]
    private static partial Regex StatusLine();

    [GeneratedRegex(@"^Objective:\s+\S+\s*=\s*(\S+)", RegexOptions.Multiline)]
    private static partial Regex ObjectiveLine();
}

/// <param name="Status">glpsol's printable status, e.g. OPTIMAL.</param>
/// <param name="Objective">The objective from the plain solution file (15 significant digits).</param>
/// <param name="PrintedObjective">The objective from the printable report (10 significant digits).</param>
/// <param name="PrimalDualStatus">Primal and dual status letters of the plain solution file (f = feasible).</param>
public sealed record GlpsolSolution(string Status, double Objective, double PrintedObjective, string PrimalDualStatus);

/// <summary>A theory that reports itself skipped when the reference folder or glpsol is absent.</summary>
public sealed class GlpsolTheoryAttribute : TheoryAttribute
{
    public GlpsolTheoryAttribute()
    {
        if (ReferenceData.Folder is null)
        {
            Skip = ReferenceData.MissingReason;
        }
        else if (Glpsol.Executable is null)
        {
            Skip = Glpsol.MissingReason;
        }
    }
}
