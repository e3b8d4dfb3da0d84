using FitSpec.Pipeline.Batch;

namespace FitSpec.Pipeline;

/// <summary>
/// Turns the command line's SPEC|DIR|PATTERN arguments into an ordered list of spec files: a folder is
/// searched recursively for *.fit.yaml, a file is taken as it is, and a pattern (`specs/**/*.fit.yaml`,
/// `specs/lc*`) is expanded here, so that it works quoted too; a folder it matches is searched, a file it
/// matches counts when it is a spec. The list is in ordinal order of the paths, each file once.
/// </summary>
public static class SpecDiscovery
{
    public const string Suffix = ".fit.yaml";

    /// <param name="arguments">The paths and patterns as given.</param>
    /// <param name="missing">Arguments that name nothing, or patterns that match no spec.</param>
    public static IReadOnlyList<string> Find(IEnumerable<string> arguments, out IReadOnlyList<string> missing)
    {
        ArgumentNullException.ThrowIfNull(arguments);
        var files = new List<string>();
        var notFound = new List<string>();
        foreach (var arg in arguments)
        {
            if (Directory.Exists(arg))
            {
                files.AddRange(SpecsIn(arg));
            }
            else if (File.Exists(arg))
            {
                files.Add(arg);
            }
            else if (PathGlob.IsPattern(arg))
            {
                var matched = PathGlob.Expand(arg)
                    .SelectMany(p => Directory.Exists(p) ? SpecsIn(p) : p.EndsWith(Suffix, StringComparison.Ordinal) ? [p] : [])
                    .ToList();
                if (matched.Count == 0)
                {
                    notFound.Add(arg);
                }

                files.AddRange(matched);
            }
            else
            {
                notFound.Add(arg);
            }
        }

        missing = notFound;

        // One file reached twice (a folder and a pattern, or `./a` and `a`) is run once, under its first spelling.
        var seen = new HashSet<string>(OperatingSystem.IsWindows() ? StringComparer.OrdinalIgnoreCase : StringComparer.Ordinal);
        return files.Order(StringComparer.Ordinal).Where(f => seen.Add(Path.GetFullPath(f))).ToList();
    }

    private static IEnumerable<string> SpecsIn(string folder) =>
        Directory.EnumerateFiles(folder, "*" + Suffix, SearchOption.AllDirectories);
}
