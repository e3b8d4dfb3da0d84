namespace FitSpec.Tests.Faults;

/// <summary>
/// A folder with the immutable attribute (chattr +i): no entry can be made, renamed or removed in it, even by
/// root, which is what a read-only folder is to any other user. Needs a file system with the attribute (ext4,
/// xfs, btrfs) and the right to set it; where that is missing, <see cref="SkipReason"/> says so.
/// </summary>
public sealed class ImmutableFolder : IDisposable
{
    private static readonly Lazy<string?> Probe = new(ProbeAttribute);

    private readonly List<string> _folders = [];

    /// <summary>Sets the attribute on <paramref name="path"/>, and on every folder below it when <paramref name="withSubfolders"/>.</summary>
    public ImmutableFolder(string path, bool withSubfolders)
    {
        var folders = withSubfolders ? Directory.GetDirectories(path, "*", SearchOption.AllDirectories).Prepend(path) : [path];
        foreach (var folder in folders)
        {
            Command.Check("chattr", "+i", folder);
            _folders.Add(folder);
        }
    }

    /// <summary>Sets the attribute on each of <paramref name="files"/>: they cannot be replaced, while their folder stays writable.</summary>
    public ImmutableFolder(IEnumerable<string> files)
    {
        foreach (var file in files)
        {
            Command.Check("chattr", "+i", file);
            _folders.Add(file);
        }
    }

    /// <summary>Why the attribute cannot be used here (the temp folder's file system), or null when it can.</summary>
    public static string? SkipReason => Probe.Value;

    public void Dispose()
    {
        foreach (var folder in _folders)
        {
            Command.Run("chattr", "-i", folder);
        }
    }

    private static string? ProbeAttribute()
    {
        if (!OperatingSystem.IsLinux())
        {
            return "the immutable attribute is Linux only";
        }

        var probe = System.IO.Path.Combine(System.IO.Path.GetTempPath(), "fitspec-immutable-probe-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(probe);
        try
        {
            var (exit, output) = Command.Run("chattr", "+i", probe);
            if (exit != 0)
            {
                return $"chattr +i does not work on the temp folder's file system here: {output}";
            }

            try
            {
                File.WriteAllText(System.IO.Path.Combine(probe, "x"), "x");
                return "chattr +i did not stop a file being made in the folder";
            }
            catch (UnauthorizedAccessException)
            {
                return null;
            }
            finally
            {
                Command.Run("chattr", "-i", probe);
            }
        }
        finally
        {
            Directory.Delete(probe, recursive: true);
        }
    }
}

/// <summary>A fact that needs the immutable attribute: skipped, with the reason, where it cannot be set.</summary>
public sealed class ImmutableFactAttribute : FactAttribute
{
    public ImmutableFactAttribute()
    {
        if (ImmutableFolder.SkipReason is { } reason)
        {
            Skip = reason;
        }
    }
}
