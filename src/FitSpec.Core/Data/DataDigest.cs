using System.Security.Cryptography;
using System.Text;
using FitSpec.Spec;

namespace FitSpec.Data;

/// <summary>
/// The SHA-256 that results carry as the data's provenance. A file source (CSV, TSV, Parquet) is named by
/// the digest of its bytes. An SQLite source is named by its database and its query together: the digest
/// of the UTF-8 text "&lt;lower-case hex SHA-256 of the database file&gt;\n&lt;query as written&gt;", so the same
/// database read by another query, or the same query on a changed database, gets another digest.
/// </summary>
public static class DataDigest
{
    /// <summary>SHA-256 of a file's bytes, as lower-case hex.</summary>
    public static string OfFile(string path)
    {
        using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 20);
        return Convert.ToHexStringLower(SHA256.HashData(stream));
    }

    /// <summary>The digest of an SQLite source: the database file's digest and the query text (see the class summary).</summary>
    public static string OfQuery(string databasePath, string query)
    {
        ArgumentNullException.ThrowIfNull(query);
        return OfQueryText(OfFile(databasePath), query);
    }

    internal static string OfQueryText(string databaseSha256, string query) =>
        Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(databaseSha256 + "\n" + query)));

    /// <summary>
    /// The digest a spec's data would get when loaded, without loading it (for caches that must know
    /// whether the data changed); null when the data file or database cannot be read.
    /// </summary>
    public static string? ForSpec(FitSpecDocument spec)
    {
        ArgumentNullException.ThrowIfNull(spec);
        var data = spec.Data;
        var file = data.Path ?? data.Sqlite;
        if (file is null)
        {
            return null;
        }

        var full = Path.GetFullPath(Path.Combine(spec.Folder, file.Value));
        if (!File.Exists(full) || new FileInfo(full).Length > TableLoader.MaxFileBytes)
        {
            // Missing or past the size limit: the fit is refused without reading it.
            return null;
        }

        try
        {
            return data.Sqlite is not null && data.Query is { } query ? OfQuery(full, query.Value) : OfFile(full);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return null;
        }
    }
}
