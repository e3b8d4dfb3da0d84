namespace FitSpec.Data;

/// <summary>
/// The rows a fit uses, as columns of doubles, with where each row came from and what was left out.
/// Lines[i] is the data-file line of row i (the header is line 1). DisplayPath is the path as the spec
/// wrote it (for results); ErrorPath is the path from the working folder (for error messages).
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
