using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.RegularExpressions;
using FitSpec.Pipeline.Batch;

namespace FitSpec.Tests.Faults;

/// <summary>
/// What an out folder must look like after any fault: every file under its final name complete for its kind,
/// every cache entry a complete entry, and nothing else but temp files of the atomic writer
/// (".NAME.PID.GUID.tmp"), which a killed process cannot remove and which never carry a final name.
/// </summary>
public static partial class OutFolder
{
    /// <summary>Temp files (relative paths) anywhere under <paramref name="outDir"/>.</summary>
    public static IReadOnlyList<string> TempFiles(string outDir) =>
        All(outDir).Where(IsTemp).Order(StringComparer.Ordinal).ToList();

    /// <summary>Every file under a final name (relative path → bytes), the cache entries included.</summary>
    public static Dictionary<string, byte[]> FinalFiles(string outDir) =>
        All(outDir).Where(f => !IsTemp(f)).ToDictionary(f => f, f => File.ReadAllBytes(Path.Combine(outDir, f)), StringComparer.Ordinal);

    /// <summary>The reports, plots and index pages (relative path → bytes): the final files outside the cache.</summary>
    public static Dictionary<string, byte[]> Reports(string outDir) =>
        FinalFiles(outDir).Where(f => !InCache(f.Key)).ToDictionary(f => f.Key, f => f.Value, StringComparer.Ordinal);

    /// <summary>
    /// Every final-named file is whole: JSON parses, HTML ends with its closing tag, SVG likewise, Markdown is
    /// non-empty text ending in a newline, and each cache entry is a complete entry filed under its own key.
    /// </summary>
    public static void AssertComplete(string outDir)
    {
        foreach (var (path, bytes) in FinalFiles(outDir))
        {
            var text = Encoding.UTF8.GetString(bytes);
            if (InCache(path))
            {
                var entry = CacheEntry.Parse(text);
                Assert.True(entry is not null, $"{path}: not a complete cache entry");
                Assert.Equal(Path.GetFileNameWithoutExtension(path), entry.Key);
                continue;
            }

            switch (Path.GetExtension(path))
            {
                case ".json":
                    AssertParses(path, bytes);
                    break;
                case ".html":
                    Assert.True(text.TrimEnd().EndsWith("</html>", StringComparison.Ordinal), $"{path}: does not end with </html>");
                    break;
                case ".svg":
                    Assert.True(text.TrimEnd().EndsWith("</svg>", StringComparison.Ordinal), $"{path}: does not end with </svg>");
                    break;
                case ".md":
                    Assert.True(text.Length > 0 && text.EndsWith('\n'), $"{path}: empty or cut short");
                    break;
                default:
                    Assert.Fail($"{path}: a file the out folder should not hold");
                    break;
            }
        }
    }

    /// <summary>Every temp file left is one the atomic writer names, made by process <paramref name="pid"/>.</summary>
    public static void AssertTempFilesOnlyFrom(string outDir, int pid)
    {
        foreach (var temp in TempFiles(outDir))
        {
            var match = TempName().Match(Path.GetFileName(temp));
            Assert.True(match.Success, $"{temp}: a temp file not named as the atomic writer names them");
            Assert.Equal(pid.ToString(CultureInfo.InvariantCulture), match.Groups["pid"].Value);
        }
    }

    private static void AssertParses(string path, byte[] bytes)
    {
        try
        {
            using var _ = JsonDocument.Parse(bytes);
        }
        catch (JsonException e)
        {
            Assert.Fail($"{path}: not valid JSON ({e.Message})");
        }
    }

    private static IEnumerable<string> All(string outDir) =>
        Directory.Exists(outDir)
            ? Directory.EnumerateFiles(outDir, "*", SearchOption.AllDirectories).Select(f => Path.GetRelativePath(outDir, f))
            : [];

    private static bool InCache(string relative) =>
        relative.StartsWith(FitCache.FolderName + Path.DirectorySeparatorChar, StringComparison.Ordinal);

    private static bool IsTemp(string relative)
    {
        var name = Path.GetFileName(relative);
        return name.StartsWith('.') && name.EndsWith(".tmp", StringComparison.Ordinal);
    }

    /// <summary>A temp name as the atomic writer gives it, e.g. ".fit03.html.4711.0123456789abcdef0123456789abcdef.tmp" (source: the product's own naming in src/FitSpec.Core/Results/AtomicFile.cs; an illustration, not a check value).</summary>
    [GeneratedRegex(@"^\.(?<final>.+)\.(?<pid>\d+)\.[0-9a-f]{32}\.tmp$")]
    private static partial Regex TempName();
}
