using System.Text;

namespace FitSpec.Fuzz.Harness;

/// <summary>
/// One generated input: the bytes fed to the entry point, a target-specific variant (which seed, which
/// spec around a CSV, which expression context) and whether this input also goes through a full fit.
/// Every target's input has this one shape so that saving and minimising work the same for all.
/// </summary>
public sealed record FuzzCase(byte[] Data, int Variant, bool Pipeline)
{
    public string Text => Encoding.UTF8.GetString(Data);

    /// <summary>A short printable rendering for reports: control characters escaped, long input cut.</summary>
    public string Preview(int max = 300)
    {
        var text = Text;
        var builder = new StringBuilder();
        foreach (var c in text.Length > max ? text[..max] : text)
        {
            builder.Append(c switch
            {
                '\n' => "\\n",
                '\r' => "\\r",
                '\t' => "\\t",
                _ when char.IsControl(c) || char.IsSurrogate(c) => $"\\u{(int)c:X4}",
                _ => c.ToString(),
            });
        }

        if (text.Length > max)
        {
            builder.Append($"… ({Data.Length} bytes)");
        }

        return $"variant {Variant}{(Pipeline ? ", full fit" : "")}: {builder}";
    }
}

/// <summary>How an input ended when the code behaved: with a result, or with a clean, located error.</summary>
public enum Outcome
{
    Result,
    CleanError,
}

/// <summary>What kind of property an input broke.</summary>
public enum FailureKind
{
    /// <summary>An exception other than the clean error type escaped the entry point.</summary>
    Unhandled,

    /// <summary>The entry point returned, but its answer breaks its own contract (e.g. an error without a position).</summary>
    Contract,

    /// <summary>The input took longer than the target's time budget.</summary>
    Slow,

    /// <summary>The input allocated more than the target's memory budget.</summary>
    Memory,
}

/// <summary>Thrown by a target's checks when the entry point's answer breaks its contract.</summary>
public sealed class ContractViolation : Exception
{
    public ContractViolation(string message)
        : base(message)
    {
    }

    public ContractViolation()
    {
    }

    public ContractViolation(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
