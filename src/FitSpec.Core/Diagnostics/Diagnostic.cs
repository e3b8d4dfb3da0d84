namespace FitSpec.Diagnostics;

/// <summary>
/// One located user error: in the spec (line and column, 1-based) or in a data file (line only; the header
/// is line 1). Field names the spec key or data column concerned, when there is one.
/// </summary>
public sealed record Diagnostic(string File, int? Line, int? Column, string? Field, string Message)
{
    /// <summary>The one-line compiler form: FILE:LINE:COLUMN: error: message (data errors name the column).</summary>
    public override string ToString()
    {
        var place = File;
        if (Line is { } line)
        {
            place += $":{line}";
            if (Column is { } column)
            {
                place += $":{column}";
            }
        }

        return Column is null && Line is not null && Field is not null
            ? $"{place}: error: column '{Field}': {Message}"
            : $"{place}: error: {Message}";
    }
}

/// <summary>Thrown only to unwind a stage that met user errors; carries every diagnostic collected so far.</summary>
public sealed class FitSpecException : Exception
{
    public FitSpecException(IReadOnlyList<Diagnostic> diagnostics)
        : base(string.Join(Environment.NewLine, diagnostics))
    {
        Diagnostics = diagnostics;
    }

    public FitSpecException(Diagnostic diagnostic)
        : this([diagnostic])
    {
    }

    public FitSpecException()
        : this([])
    {
    }

    public FitSpecException(string message)
        : this(new Diagnostic("", null, null, null, message))
    {
    }

    public FitSpecException(string message, Exception innerException)
        : base(message, innerException)
    {
        Diagnostics = [new Diagnostic("", null, null, null, message)];
    }

    public IReadOnlyList<Diagnostic> Diagnostics { get; }
}

/// <summary>Suggests the nearest known name for a misspelt one (edit distance), for "did you mean" hints.</summary>
public static class NameSuggester
{
    public static string? Suggest(string given, IEnumerable<string> known)
    {
        ArgumentNullException.ThrowIfNull(given);
        ArgumentNullException.ThrowIfNull(known);
        string? best = null;
        var bestDistance = int.MaxValue;
        foreach (var name in known)
        {
            var d = Distance(given.ToLowerInvariant(), name.ToLowerInvariant());
            if (d < bestDistance)
            {
                bestDistance = d;
                best = name;
            }
        }

        var limit = Math.Max(1, given.Length / 3);
        return bestDistance <= limit ? best : null;
    }

    public static string Hint(string given, IEnumerable<string> known) =>
        Suggest(given, known) is { } s ? $" (did you mean '{s}'?)" : "";

    private static int Distance(string a, string b)
    {
        var prev = new int[b.Length + 1];
        var cur = new int[b.Length + 1];
        for (var j = 0; j <= b.Length; j++)
        {
            prev[j] = j;
        }

        for (var i = 1; i <= a.Length; i++)
        {
            cur[0] = i;
            for (var j = 1; j <= b.Length; j++)
            {
                var cost = a[i - 1] == b[j - 1] ? 0 : 1;
                cur[j] = Math.Min(Math.Min(cur[j - 1] + 1, prev[j] + 1), prev[j - 1] + cost);
            }

            (prev, cur) = (cur, prev);
        }

        return prev[b.Length];
    }
}
