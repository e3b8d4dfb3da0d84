using FitSpec.Diagnostics;
using FitSpec.Fuzz.Harness;
using FitSpec.Pipeline;
using FitSpec.Results;

namespace FitSpec.Fuzz.Targets;

/// <summary>The contract every clean answer must keep, shared by the targets.</summary>
public static class Checks
{
    private static readonly HashSet<string> Statuses = new(StringComparer.Ordinal)
    {
        "optimal", "local-optimum", "infeasible", "unbounded", "time-limit", "error",
    };

    /// <summary>Spec errors name a line and a column (1-based) and say something.</summary>
    public static void SpecErrors(IReadOnlyList<Diagnostic> errors, string what)
    {
        ArgumentNullException.ThrowIfNull(errors);
        foreach (var e in errors)
        {
            Said(e, what);
            if (e.Line is not >= 1 || e.Column is not >= 1)
            {
                throw new ContractViolation($"unlocated spec error: {what} gave '{e}' without a line and column");
            }
        }
    }

    /// <summary>Data errors name the file and, when they give one, a line of it (1-based).</summary>
    public static void DataErrors(IReadOnlyList<Diagnostic> errors, string what)
    {
        ArgumentNullException.ThrowIfNull(errors);
        if (errors.Count == 0)
        {
            throw new ContractViolation($"empty error: {what} threw a clean error with no diagnostics");
        }

        foreach (var e in errors)
        {
            Said(e, what);
            if (e.Line is < 1 || e.Column is < 1)
            {
                throw new ContractViolation($"bad position: {what} gave '{e}'");
            }
        }
    }

    /// <summary>A full fit ends in one of the statuses SPEC.md lists, and an error result says why.</summary>
    public static Outcome FitResult(FitResult result, Tally tally)
    {
        ArgumentNullException.ThrowIfNull(result);
        ArgumentNullException.ThrowIfNull(tally);
        if (!Statuses.Contains(result.Status))
        {
            throw new ContractViolation($"unknown status: a fit ended with status '{result.Status}'");
        }

        tally.Add($"full fit {result.Status}");
        if (result.Status != "error")
        {
            return Outcome.Result;
        }

        if (result.Errors.Count == 0 && string.IsNullOrWhiteSpace(result.StatusDetail))
        {
            throw new ContractViolation("silent error result: a fit ended in 'error' without errors or a detail");
        }

        foreach (var e in result.Errors)
        {
            if (e.Message.StartsWith("internal error", StringComparison.Ordinal))
            {
                throw new ContractViolation($"internal error result: {e.Message}");
            }
        }

        return Outcome.CleanError;
    }

    /// <summary>Runs a full fit from a spec file: only a result may come back, never an exception.</summary>
    public static Outcome FullFit(string specPath, Tally tally) => FitResult(FitRunner.Run(specPath), tally);

    private static void Said(Diagnostic e, string what)
    {
        if (string.IsNullOrWhiteSpace(e.Message) || string.IsNullOrEmpty(e.File))
        {
            throw new ContractViolation($"empty message: {what} gave '{e}'");
        }
    }
}
