using System.Globalization;
using System.Text.Json;

namespace FitSpec.ReferenceTests.Support;

/// <summary>
/// Locates the shared reference folder (NIST StRD and published worked examples, each with its source):
/// FITSPEC_REFERENCE_DIR if set, else ../shared/reference next to the repository root.
/// </summary>
public static class ReferenceData
{
    public static string? Folder { get; } = Locate();

    public static string MissingReason =>
        "reference folder not found (set FITSPEC_REFERENCE_DIR or place it at ../shared/reference beside the repository)";

    public static string PathOf(string relative) =>
        Path.Combine(Folder ?? throw new InvalidOperationException(MissingReason), relative);

    public static JsonElement Json(string relative) => JsonDocument.Parse(File.ReadAllText(PathOf(relative))).RootElement;

    public static double Number(JsonElement e) => e.ValueKind == JsonValueKind.Number
        ? e.GetDouble()
        : double.Parse(e.GetString()!, NumberStyles.Float, CultureInfo.InvariantCulture);

    private static string? Locate()
    {
        var env = Environment.GetEnvironmentVariable("FITSPEC_REFERENCE_DIR");
        if (!string.IsNullOrEmpty(env))
        {
            return Directory.Exists(env) ? env : null;
        }

        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "FitSpec.sln")))
            {
                var candidate = Path.GetFullPath(Path.Combine(dir.FullName, "..", "shared", "reference"));
                return Directory.Exists(candidate) ? candidate : null;
            }
        }

        return null;
    }
}

/// <summary>A fact that reports itself skipped, with the reason, when the reference folder is absent.</summary>
public sealed class ReferenceFactAttribute : FactAttribute
{
    public ReferenceFactAttribute()
    {
        if (ReferenceData.Folder is null)
        {
            Skip = ReferenceData.MissingReason;
        }
    }
}

/// <summary>A theory that reports itself skipped when the reference folder is absent.</summary>
public sealed class ReferenceTheoryAttribute : TheoryAttribute
{
    public ReferenceTheoryAttribute()
    {
        if (ReferenceData.Folder is null)
        {
            Skip = ReferenceData.MissingReason;
        }
    }
}
