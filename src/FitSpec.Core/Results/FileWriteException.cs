namespace FitSpec.Results;

/// <summary>A file that could not be written; Message is "PATH: REASON; ADVICE" (see <see cref="WriteFailure"/>).</summary>
public sealed class FileWriteException : IOException
{
    public FileWriteException()
    {
        Path = "";
    }

    public FileWriteException(string message)
        : base(message)
    {
        Path = "";
    }

    public FileWriteException(string message, Exception inner)
        : base(message, inner)
    {
        Path = "";
    }

    public FileWriteException(string path, string message, Exception inner)
        : base(message, inner)
    {
        Path = path;
        HResult = inner?.HResult ?? HResult;
    }

    /// <summary>The final path that was to be written.</summary>
    public string Path { get; }
}
