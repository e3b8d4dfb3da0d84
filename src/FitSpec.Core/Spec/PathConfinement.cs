using FitSpec.Diagnostics;

namespace FitSpec.Spec;

/// <summary>
/// Keeps the files a spec names (data.path, data.sqlite, report.templates) inside the spec's own folder tree,
/// so that a spec from elsewhere cannot make a run read, hash or report files it was not given. Paths are
/// compared after resolving symbolic links, so a link inside the folder cannot lead out of it. A spec that
/// breaks the rule is treated as invalid before anything it names is opened.
/// </summary>
public static class PathConfinement
{
    public const string Option = "--allow-outside-paths";

    /// <summary>The read spec unchanged when its paths stay inside (or <paramref name="allowOutside"/>); otherwise invalid with located errors.</summary>
    public static SpecReadResult Apply(SpecReadResult read, bool allowOutside)
    {
        ArgumentNullException.ThrowIfNull(read);
        if (allowOutside || read.Document is not { } spec)
        {
            return read;
        }

        var errors = Violations(spec).ToList();
        return errors.Count == 0 ? read : read with { Document = null, Errors = errors };
    }

    public static IEnumerable<Diagnostic> Violations(FitSpecDocument spec)
    {
        ArgumentNullException.ThrowIfNull(spec);
        var folder = Canonical(spec.Folder);
        foreach (var (field, text) in new[] { ("data.path", spec.Data.Path), ("data.sqlite", spec.Data.Sqlite), ("report.templates", spec.Report.Templates) })
        {
            if (text is null)
            {
                continue;
            }

            var target = Canonical(Path.GetFullPath(Path.Combine(spec.Folder, text.Value)));
            if (!Inside(target, folder))
            {
                yield return new Diagnostic(text.Pos.File, text.Pos.Line, text.Pos.Column, field,
                    $"'{text.Value}' leads outside the spec's folder ({folder}); a spec may only name files in its folder or below it. Move the file there, or run with {Option} if this spec is trusted");
            }
        }
    }

    // As many links as a path may pass through before it is judged as written (as the kernel's own limit).
    private const int MaxLinks = 40;

    private static bool Inside(string path, string folder)
    {
        var root = folder.EndsWith(Path.DirectorySeparatorChar) ? folder : folder + Path.DirectorySeparatorChar;
        return string.Equals(path, folder, StringComparison.Ordinal) || path.StartsWith(root, StringComparison.Ordinal);
    }

    // The absolute path with every symbolic link along it resolved (parts that do not exist are kept as written).
    private static string Canonical(string fullPath, int depth = 0)
    {
        var root = Path.GetPathRoot(fullPath) ?? "/";
        var parts = fullPath[root.Length..].Split(Path.DirectorySeparatorChar, StringSplitOptions.RemoveEmptyEntries);
        var current = root;
        for (var i = 0; i < parts.Length; i++)
        {
            var next = Path.Combine(current, parts[i]);
            FileSystemInfo info = Directory.Exists(next) ? new DirectoryInfo(next) : new FileInfo(next);
            if (info.Exists && info.LinkTarget is not null)
            {
                try
                {
                    next = info.ResolveLinkTarget(returnFinalTarget: true)?.FullName ?? next;
                }
                catch (IOException)
                {
                    // A link cycle or a dangling link: judge the path as written; opening it fails later, located.
                }

                // A resolved link may itself sit under links: start again from its target.
                if (depth < MaxLinks && !string.Equals(next, Path.Combine(current, parts[i]), StringComparison.Ordinal))
                {
                    return Canonical(Path.GetFullPath(Path.Combine([next, .. parts[(i + 1)..]])), depth + 1);
                }
            }

            current = next;
        }

        return Path.TrimEndingDirectorySeparator(current.Length == 0 ? root : current) is { Length: > 0 } trimmed ? trimmed : root;
    }
}
