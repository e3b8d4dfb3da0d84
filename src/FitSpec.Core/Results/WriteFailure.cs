namespace FitSpec.Results;

/// <summary>
/// Turns a failed write into one plain line: the path that could not be written, why in everyday words
/// (read-only file system, no space left, permission denied, a file where a folder should be) and what to do.
/// The one place that maps the system's errors, so every write error of a run reads alike.
/// </summary>
public static class WriteFailure
{
    // Linux errno values; on Unix the runtime puts the raw errno into an IOException's HResult.
    private const int NotADirectory = 20;
    private const int NoSpace = 28;
    private const int ReadOnlyFileSystem = 30;
    private const int QuotaExceeded = 122;

    /// <summary>An exception for <paramref name="path"/> whose message is "PATH: REASON; ADVICE".</summary>
    public static FileWriteException For(string path, Exception e)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(e);
        return e as FileWriteException ?? new FileWriteException(path, $"{path}: {Reason(path, e)}; {Advice(e)}", e);
    }

    /// <summary>The text to print after "cannot write ...: " for any write failure.</summary>
    public static string Message(Exception e)
    {
        ArgumentNullException.ThrowIfNull(e);
        return e is FileWriteException ? e.Message : $"{Reason(null, e)}; {Advice(e)}";
    }

    /// <summary>Why a write failed, in plain words (without the path).</summary>
    public static string Reason(string? path, Exception e)
    {
        ArgumentNullException.ThrowIfNull(e);
        if (e is FileWriteException written)
        {
            e = written.InnerException ?? e;
        }

        return e switch
        {
            UnauthorizedAccessException => "permission denied",
            IOException { HResult: ReadOnlyFileSystem } => "the file system is read-only",
            IOException { HResult: NoSpace } => "no space left on the device",
            IOException { HResult: QuotaExceeded } => "the disk quota is used up",
            DirectoryNotFoundException or IOException { HResult: NotADirectory } when FileOnPath(path) is { } file
                => $"a part of the path is a file, not a folder ('{file}')",
            IOException { HResult: NotADirectory } => "a part of the path is a file, not a folder",
            DirectoryNotFoundException => "a folder on the path does not exist (was it removed while the run went on?)",
            _ => e.Message.TrimEnd('.'),
        };
    }

    private static string Advice(Exception e)
    {
        var inner = e is FileWriteException { InnerException: { } i } ? i : e;
        return inner switch
        {
            IOException { HResult: NoSpace } => "free some space there or choose another --out",
            IOException { HResult: QuotaExceeded } => "free some space or raise the quota, or choose another --out",
            UnauthorizedAccessException => "make the folder writable for this user or choose another --out",
            _ => "choose another --out",
        };
    }

    // The nearest existing ancestor of the path when it is a regular file: what makes a folder impossible there.
    private static string? FileOnPath(string? path)
    {
        for (var current = path; !string.IsNullOrEmpty(current); current = Path.GetDirectoryName(current))
        {
            if (File.Exists(current))
            {
                return current;
            }

            if (Directory.Exists(current))
            {
                return null;
            }
        }

        return null;
    }
}
