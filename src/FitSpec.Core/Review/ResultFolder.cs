using FitSpec.Diagnostics;

namespace FitSpec.Review;

/// <summary>Reads every &lt;name&gt;.result.json directly in one folder (not its sub-folders), keyed by fit name.</summary>
public static class ResultFolder
{
    /// <summary>
    /// All results of <paramref name="folder"/>. Every unreadable file is reported (not only the first), as is
    /// a fit name held by two files; either throws a <see cref="FitSpecException"/> listing them all.
    /// </summary>
    public static ResultSet Read(string folder)
    {
        ArgumentNullException.ThrowIfNull(folder);
        string[] files;
        try
        {
            files = Directory.GetFiles(folder, "*" + ResultFile.Suffix, SearchOption.TopDirectoryOnly);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new FitSpecException(new Diagnostic(folder, null, null, null, $"cannot list the folder: {e.Message}"));
        }

        // Ordinal order makes the report of several bad files the same on every machine.
        Array.Sort(files, StringComparer.Ordinal);
        var fits = new SortedDictionary<string, ResultSummary>(StringComparer.Ordinal);
        var errors = new List<Diagnostic>();
        foreach (var file in files.Where(f => f.EndsWith(ResultFile.Suffix, StringComparison.Ordinal)))
        {
            try
            {
                var summary = ResultFile.Read(file);
                if (!fits.TryAdd(summary.Name, summary))
                {
                    errors.Add(new Diagnostic(file, null, null, "name", $"fit name '{summary.Name}' is also the name in {fits[summary.Name].File}; a folder of results holds one file per fit"));
                }
            }
            catch (FitSpecException e)
            {
                errors.AddRange(e.Diagnostics);
            }
        }

        return errors.Count > 0 ? throw new FitSpecException(errors) : new ResultSet(folder, fits);
    }
}
