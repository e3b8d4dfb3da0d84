namespace FitSpec.Tests.Faults;

/// <summary>
/// A small tmpfs mounted on a folder, for faults that permission bits cannot make for root (the tests run as
/// root, which ignores them): a read-only file system (EROFS) and a full one (ENOSPC). Needs root with the
/// right to mount; where that is missing, <see cref="SkipReason"/> says so and the tests are skipped.
/// </summary>
public sealed class TmpfsMount : IDisposable
{
    private static readonly Lazy<string?> Probe = new(ProbeMount);

    /// <summary>Mounts a tmpfs of <paramref name="size"/> (as mount takes it: "2m") on <paramref name="path"/>, created if missing.</summary>
    public TmpfsMount(string path, string size)
    {
        Path = path;
        Directory.CreateDirectory(path);
        Command.Check("mount", "-t", "tmpfs", "-o", $"size={size},mode=0755", "tmpfs", path);
    }

    public string Path { get; }

    /// <summary>Why mounting is not possible here, or null when it is.</summary>
    public static string? SkipReason => Probe.Value;

    /// <summary>Bytes a non-privileged writer can still put on the file system.</summary>
    public long FreeBytes => new DriveInfo(Path).AvailableFreeSpace;

    /// <summary>Makes the mounted file system read-only, files and all, for root too.</summary>
    public void RemountReadOnly() => Command.Check("mount", "-o", "remount,ro", Path);

    public void Dispose()
    {
        if (Command.Run("umount", Path).ExitCode != 0)
        {
            // Something still has a file open there: detach it now, the kernel frees it when that closes.
            Command.Run("umount", "-l", Path);
        }
    }

    private static string? ProbeMount()
    {
        if (!OperatingSystem.IsLinux())
        {
            return "tmpfs mounts are Linux only";
        }

        var probe = System.IO.Path.Combine(System.IO.Path.GetTempPath(), "fitspec-mount-probe-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(probe);
        try
        {
            var (exit, output) = Command.Run("mount", "-t", "tmpfs", "-o", "size=64k", "tmpfs", probe);
            if (exit != 0)
            {
                return $"mounting a tmpfs is not permitted here (needs root allowed to mount, as in the CI container): {output}";
            }

            Command.Run("umount", probe);
            return null;
        }
        finally
        {
            Directory.Delete(probe);
        }
    }
}

/// <summary>A fact that needs to mount a tmpfs: skipped, with the reason, where mounting is not permitted.</summary>
public sealed class MountFactAttribute : FactAttribute
{
    public MountFactAttribute()
    {
        if (TmpfsMount.SkipReason is { } reason)
        {
            Skip = reason;
        }
    }
}
