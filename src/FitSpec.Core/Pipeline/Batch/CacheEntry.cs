using System.Text.Json;
using System.Text.Json.Serialization;

namespace FitSpec.Pipeline.Batch;

/// <summary>An output file of a fit: its path relative to the out folder ('/'-separated) and its SHA-256.</summary>
public sealed record CachedOutput(string Path, string Sha256);

/// <summary>
/// What the cache remembers of one fit: the key it was made under, the summary to report, and the files it
/// wrote with their hashes (a hit needs all of them still there, unchanged). Holds no times, so two runs
/// that write the same files write the same entry.
/// </summary>
public sealed record CacheEntry(string Format, string Key, FitSummary Summary, IReadOnlyList<CachedOutput> Outputs)
{
    public const string CurrentFormat = "fitspec-cache-entry/1";

    private static readonly JsonSerializerOptions Options = new()
    {
        PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower,
        NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
        WriteIndented = true,
        IgnoreReadOnlyProperties = true,
    };

    public string ToJson() => JsonSerializer.Serialize(this, Options) + "\n";

    /// <summary>The entry in <paramref name="json"/>, or null when it is not a complete entry of this format.</summary>
    public static CacheEntry? Parse(string json)
    {
        CacheEntry? entry;
        try
        {
            entry = JsonSerializer.Deserialize<CacheEntry>(json, Options);
        }
        catch (Exception e) when (e is JsonException or NotSupportedException or ArgumentException or InvalidOperationException)
        {
            return null;
        }

        return entry is not null && entry.IsComplete() ? entry : null;
    }

    // JSON can leave any member null whatever the C# type says; a partial entry is a miss, never a crash later.
    private bool IsComplete()
    {
        var s = Summary;
        return Format == CurrentFormat && Key is not null && Outputs is not null && s is not null
            && s.Name is not null && s.SpecFile is not null && s.Status is not null && s.Errors is not null
            && s.Errors.All(e => e is not null)
            && Outputs.All(o => o is not null && o.Sha256 is not null && IsInside(o.Path));
    }

    // An entry may only ever point at files inside the out folder.
    private static bool IsInside(string? path) =>
        !string.IsNullOrEmpty(path) && !System.IO.Path.IsPathRooted(path)
        && path.Split('/', '\\').All(part => part.Length > 0 && part != "." && part != "..");
}
