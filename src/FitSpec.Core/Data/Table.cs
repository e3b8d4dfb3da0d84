namespace FitSpec.Data;

/// <summary>
/// The rows a fit uses, as columns of doubles, with where each row came from and what was left out.
/// Lines[i] is where row i came from: its line in a CSV/TSV file (the header is line 1), or its 1-based
/// row number in a Parquet file or an SQLite query's result. DisplayPath is the path as the spec wrote it
/// (for an SQLite source, the database path and the query, for results); ErrorPath is the data file's
/// path from the working folder (for error messages); Sha256 is the data's digest (<see cref="DataDigest"/>).
/// </summary>
public sealed record Table(
    string File,
    string DisplayPath,
    string ErrorPath,
    string Sha256,
    IReadOnlyList<string> Header,
    IReadOnlyDictionary<string, double[]> Columns,
    int[] Lines,
    int RowsRead,
    int DroppedMissing,
    int DroppedFilter)
{
    public int RowCount => Lines.Length;
}
