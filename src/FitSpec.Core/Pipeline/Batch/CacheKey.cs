using System.Globalization;
using System.Runtime.InteropServices;
using System.Security.Cryptography;
using System.Text;
using FitSpec.Reporting;
using FitSpec.Solving;
using FitSpec.Spec;

namespace FitSpec.Pipeline.Batch;

/// <summary>
/// The facts shared by every fit of a run that decide its files: the tool (its version and the exact build,
/// the solver, the runtime), the built-in report templates, the formats asked for and the stamp flag.
/// </summary>
public sealed record KeyContext(string Tool, string DefaultTemplates, string Formats, bool Stamp)
{
    public static KeyContext For(IReadOnlyList<ReportFormat> formats, bool stamp)
    {
        ArgumentNullException.ThrowIfNull(formats);

        // The module id changes with every build of different code (builds are deterministic), so a
        // development build with an unchanged version number still misses the cache after a code change.
        var tool = string.Join('\n',
            FitRunner.ToolVersion,
            typeof(FitRunner).Assembly.ManifestModule.ModuleVersionId.ToString("N"),
            Solver.HighsVersion,
            RuntimeInformation.FrameworkDescription,
            RuntimeInformation.OSDescription);
        var templates = ReportRenderer.DefaultTemplateFolder is { } folder
            ? CacheKey.FolderDigest(folder, name => name.EndsWith(".sbn", StringComparison.Ordinal) && !name.StartsWith("index.", StringComparison.Ordinal))
            : "none";
        return new KeyContext(tool, templates, string.Join(',', formats.Select(f => f.ToString())), stamp);
    }
}

/// <summary>A fit's key, and the digests of the spec and data it was made from (to check what the run saw).</summary>
public sealed record FitKey(string Value, string SpecSha256, string? DataSha256);

/// <summary>
/// A fit's cache key: SHA-256 over everything its output files are made from, so equal keys mean the fit
/// would write the same files again. The spec is read (not run) to find its data file and templates.
/// </summary>
public static class CacheKey
{
    private const string Version = "fitspec-fit-key/1";

    public static FitKey Compute(string specPath, SpecReadResult read, KeyContext context)
    {
        ArgumentNullException.ThrowIfNull(specPath);
        ArgumentNullException.ThrowIfNull(read);
        ArgumentNullException.ThrowIfNull(context);
        using var hash = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        Add(hash, "version", Version);
        Add(hash, "tool", context.Tool);
        Add(hash, "default-templates", context.DefaultTemplates);
        Add(hash, "formats", context.Formats);
        Add(hash, "stamp", context.Stamp ? "yes" : "no");

        // Results name the spec as given, and data paths as seen from the working directory.
        Add(hash, "spec-path", specPath);
        Add(hash, "spec-full-path", Path.GetFullPath(specPath));
        Add(hash, "spec", read.Bytes);
        string? dataSha = null;
        if (read.Document is { } spec)
        {
            if (spec.Data.Path is { } data)
            {
                var full = Path.GetFullPath(Path.Combine(spec.Folder, data.Value));
                Add(hash, "data-path", full);
                // A file past the fit's size limit is refused unread, so it is not read for its key either.
                dataSha = TooLarge(full) is { } length ? $"too-large:{length}" : FileDigest(full);
                Add(hash, "data", dataSha);
            }
            else if (spec.Data.Sqlite is { } database && Data.DataDigest.ForSpec(spec) is { } digest)
            {
                // The database's bytes and the query, as the result's provenance records them.
                Add(hash, "data-path", Path.GetFullPath(Path.Combine(spec.Folder, database.Value)));
                dataSha = digest;
                Add(hash, "data", dataSha);
            }

            if (spec.Report.Templates is { } templates)
            {
                var folder = Path.GetFullPath(Path.Combine(spec.Folder, templates.Value));
                Add(hash, "templates-path", folder);
                Add(hash, "templates", FolderDigest(folder, _ => true));
            }
        }

        return new FitKey(Convert.ToHexStringLower(hash.GetHashAndReset()), Convert.ToHexStringLower(SHA256.HashData(read.Bytes)), dataSha);
    }

    private static long? TooLarge(string path)
    {
        try
        {
            var info = new FileInfo(path);
            return info.Exists && info.Length > Data.TableLoader.MaxFileBytes ? info.Length : null;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return null;
        }
    }

    /// <summary>SHA-256 of a file's bytes (lower-case hex), or a marker when it cannot be read.</summary>
    public static string FileDigest(string path)
    {
        try
        {
            using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete, 1 << 16);
            return Convert.ToHexStringLower(SHA256.HashData(stream));
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return "unreadable";
        }
    }

    /// <summary>A digest of the names and bytes of the files directly in a folder that <paramref name="include"/> accepts.</summary>
    public static string FolderDigest(string folder, Func<string, bool> include)
    {
        ArgumentNullException.ThrowIfNull(include);
        if (!Directory.Exists(folder))
        {
            return "absent";
        }

        var sb = new StringBuilder();
        foreach (var file in Directory.EnumerateFiles(folder).Order(StringComparer.Ordinal))
        {
            var name = Path.GetFileName(file);
            if (include(name))
            {
                sb.Append(name).Append('=').Append(FileDigest(file)).Append('\n');
            }
        }

        return sb.ToString();
    }

    private static void Add(IncrementalHash hash, string label, string value) => Add(hash, label, Encoding.UTF8.GetBytes(value));

    // Each part is labelled and length-prefixed, so no two different inputs can run together into one.
    private static void Add(IncrementalHash hash, string label, byte[] value)
    {
        hash.AppendData(Encoding.UTF8.GetBytes($"{label}:{value.Length.ToString(CultureInfo.InvariantCulture)}:"));
        hash.AppendData(value);
        hash.AppendData("\n"u8);
    }
}
