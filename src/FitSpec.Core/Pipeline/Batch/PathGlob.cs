using System.Text;
using System.Text.RegularExpressions;

namespace FitSpec.Pipeline.Batch;

/// <summary>
/// Expands a path pattern given on the command line (quoted, so the shell left it alone): `*` and `?` match
/// within one path segment, `**` matches any number of folders. As in a shell, wildcards do not match names
/// starting with '.' unless the pattern segment itself starts with '.', so hidden folders (the cache among
/// them) are never searched by accident.
/// </summary>
public static class PathGlob
{
    private static readonly EnumerationOptions OneLevel = new()
    {
        RecurseSubdirectories = false,
        IgnoreInaccessible = true,
        AttributesToSkip = 0,
        ReturnSpecialDirectories = false,
    };

    /// <summary>True when the text has a wildcard, i.e. is meant as a pattern rather than a path.</summary>
    public static bool IsPattern(string text) =>
        text is not null && text.IndexOfAny(['*', '?']) >= 0;

    /// <summary>
    /// Every existing file and folder the pattern matches, spelled as the pattern spells its fixed part
    /// (a relative pattern gives relative paths), in ordinal order.
    /// </summary>
    public static IReadOnlyList<string> Expand(string pattern)
    {
        ArgumentNullException.ThrowIfNull(pattern);
        var rooted = pattern.StartsWith('/') || (Path.DirectorySeparatorChar == '\\' && Path.IsPathRooted(pattern));
        var segments = pattern.Split(Separators(), StringSplitOptions.RemoveEmptyEntries);
        var start = "";
        if (rooted)
        {
            start = Path.GetPathRoot(pattern) ?? "/";
            if (Path.DirectorySeparatorChar == '\\' && start.Length > 0 && segments.Length > 0 && start.StartsWith(segments[0], StringComparison.OrdinalIgnoreCase))
            {
                segments = segments[1..]; // the drive ("C:") is part of the root
            }
        }

        var found = new SortedSet<string>(StringComparer.Ordinal);
        Walk(start, segments, 0, found);
        return [.. found];
    }

    private static char[] Separators() => Path.DirectorySeparatorChar == '\\' ? ['/', '\\'] : ['/'];

    private static void Walk(string folder, string[] segments, int index, SortedSet<string> found)
    {
        if (index == segments.Length)
        {
            found.Add(folder);
            return;
        }

        var segment = segments[index];
        var last = index == segments.Length - 1;
        if (segment == "**")
        {
            // Zero folders, then every visible folder below, each continuing with the rest of the pattern.
            Walk(folder, segments, index + 1, found);
            foreach (var sub in VisibleFolders(folder))
            {
                Walk(sub, segments, index, found);
            }

            return;
        }

        if (!IsPattern(segment))
        {
            var path = Join(folder, segment);
            if (last ? File.Exists(path) || Directory.Exists(path) : Directory.Exists(path))
            {
                Walk(path, segments, index + 1, found);
            }

            return;
        }

        var regex = SegmentRegex(segment);
        foreach (var entry in Entries(folder))
        {
            var name = Path.GetFileName(entry);
            if (!regex.IsMatch(name) || (name.StartsWith('.') && !segment.StartsWith('.')))
            {
                continue;
            }

            var path = Join(folder, name);
            if (last)
            {
                found.Add(path);
            }
            else if (Directory.Exists(path))
            {
                Walk(path, segments, index + 1, found);
            }
        }
    }

    private static IEnumerable<string> VisibleFolders(string folder)
    {
        var at = folder.Length == 0 ? "." : folder;
        if (!Directory.Exists(at))
        {
            return [];
        }

        // Linked folders are not followed: a link back up the tree would never end.
        return Directory.EnumerateDirectories(at, "*", OneLevel)
            .Select(Path.GetFileName)
            .Where(n => n is not null && !n.StartsWith('.'))
            .Where(n => new DirectoryInfo(Path.Combine(at, n!)).LinkTarget is null)
            .Order(StringComparer.Ordinal)
            .Select(n => Join(folder, n!))
            .ToList();
    }

    private static IEnumerable<string> Entries(string folder)
    {
        var at = folder.Length == 0 ? "." : folder;
        return Directory.Exists(at) ? Directory.EnumerateFileSystemEntries(at, "*", OneLevel).ToList() : [];
    }

    private static string Join(string folder, string name) =>
        folder.Length == 0 ? name : folder.EndsWith('/') || folder.EndsWith(Path.DirectorySeparatorChar) ? folder + name : folder + "/" + name;

    private static Regex SegmentRegex(string segment)
    {
        var sb = new StringBuilder("^");
        foreach (var ch in segment)
        {
            sb.Append(ch switch
            {
                '*' => "[^/]*",
                '?' => "[^/]",
                _ => Regex.Escape(ch.ToString()),
            });
        }

        sb.Append('$');
        var options = RegexOptions.CultureInvariant | (OperatingSystem.IsWindows() ? RegexOptions.IgnoreCase : RegexOptions.None);
        return new Regex(sb.ToString(), options);
    }
}
