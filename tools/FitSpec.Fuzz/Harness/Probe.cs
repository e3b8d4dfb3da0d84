using System.Diagnostics;

namespace FitSpec.Fuzz.Harness;

/// <summary>What went wrong with one input; inputs with the same Signature are taken for the same bug.</summary>
public sealed record Failure(FailureKind Kind, string Signature, string Message, string Detail);

/// <summary>How one input ended: an outcome when the code behaved, otherwise a failure; and how long it took.</summary>
public sealed record ProbeResult(Outcome? Outcome, Failure? Failure, TimeSpan Elapsed, long Allocated);

/// <summary>Runs one input through a target and judges it against the time and memory budgets.</summary>
public static class Probe
{
    private const int MaxMessage = 2000;

    public static ProbeResult Run(IFuzzTarget target, FuzzCase input, Workspace workspace, Tally tally, double timeScale = 1)
    {
        ArgumentNullException.ThrowIfNull(target);
        var before = GC.GetAllocatedBytesForCurrentThread();
        var clock = Stopwatch.StartNew();
        Outcome? outcome = null;
        Failure? failure = null;
        try
        {
            outcome = target.Run(input, workspace, tally);
        }
        catch (ContractViolation v)
        {
            var key = v.Message.Split(':', 2)[0];
            failure = new Failure(FailureKind.Contract, $"contract: {key}", Cut(v.Message), Cut(v.ToString()));
        }
        catch (Exception e)
        {
            // Everything else is a bug in the code under test: only clean errors may leave an entry point.
            failure = new Failure(FailureKind.Unhandled, SignatureOf(e), Cut($"{e.GetType().FullName}: {e.Message}"), Cut(e.ToString()));
        }

        clock.Stop();
        var allocated = GC.GetAllocatedBytesForCurrentThread() - before;
        var budget = target.TimeBudget(input) * timeScale;
        if (failure is null && clock.Elapsed > budget)
        {
            failure = new Failure(FailureKind.Slow, "slow", $"took {clock.Elapsed.TotalSeconds:0.00} s; the budget is {budget.TotalSeconds:0.##} s", "");
        }

        if (failure is null && allocated > target.MemoryBudget)
        {
            failure = new Failure(FailureKind.Memory, "memory", $"allocated {allocated >> 20} MiB; the budget is {target.MemoryBudget >> 20} MiB", "");
        }

        return new ProbeResult(failure is null ? outcome : null, failure, clock.Elapsed, allocated);
    }

    /// <summary>The exception type and the innermost FitSpec method it passed through (or its top frame).</summary>
    public static string SignatureOf(Exception e)
    {
        ArgumentNullException.ThrowIfNull(e);
        var frames = new StackTrace(e, false).GetFrames();
        var methods = frames.Select(f => f.GetMethod()).Where(m => m?.DeclaringType is not null).ToList();
        var ours = methods.FirstOrDefault(m => m!.DeclaringType!.FullName!.StartsWith("FitSpec.", StringComparison.Ordinal)
            && !m.DeclaringType.FullName.StartsWith("FitSpec.Fuzz", StringComparison.Ordinal));
        var where = ours ?? methods.FirstOrDefault();
        return where is null ? e.GetType().Name : $"{e.GetType().Name} in {where.DeclaringType!.FullName}.{where.Name}";
    }

    private static string Cut(string text) => text.Length <= MaxMessage ? text : text[..MaxMessage] + "…";
}
