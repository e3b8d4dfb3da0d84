namespace FitSpec.Pipeline;

/// <summary>Turns the command line's SPEC|DIR arguments into an ordered list of spec files.</summary>
public static class SpecDiscovery
{
    public const string Suffix = ".fit.yaml";

    public static IReadOnlyList<string> Find(IEnumerable<string> arguments, out IReadOnlyList<string> missing)
    {
        ArgumentNullException.ThrowIfNull(arguments);
        var files = new List<string>();
        var notFound = new List<string>();
        foreach (var arg in arguments)
        {
            if (Directory.Exists(arg))
            {
                files.AddRange(Directory.EnumerateFiles(arg, "*" + Suffix, SearchOption.AllDirectories).Order(StringComparer.Ordinal));
            }
            else if (File.Exists(arg))
            {
                files.Add(arg);
            }
            else
            {
                notFound.Add(arg);
            }
        }

        missing = notFound;
        return files.Distinct(StringComparer.Ordinal).ToList();
    }
}
