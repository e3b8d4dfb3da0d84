namespace FitSpec.Pipeline.Batch;

/// <summary>The out folder cannot be written at all; Message is the complete one-line error to print.</summary>
public sealed class OutFolderException : Exception
{
    public OutFolderException()
    {
    }

    public OutFolderException(string message)
        : base(message)
    {
    }

    public OutFolderException(string message, Exception inner)
        : base(message, inner)
    {
    }
}
