namespace FitSpec.Tests.Support;

/// <summary>A fresh folder under the system temp folder, removed when disposed.</summary>
public sealed class TempFolder : IDisposable
{
    public TempFolder(string prefix = "fitspec-test")
    {
        Path = System.IO.Path.Combine(System.IO.Path.GetTempPath(), $"{prefix}-{Guid.NewGuid():N}");
        Directory.CreateDirectory(Path);
    }

    public string Path { get; }

    /// <summary>Writes a file in the folder and returns its full path.</summary>
    public string Write(string name, string text)
    {
        var full = System.IO.Path.Combine(Path, name);
        File.WriteAllText(full, text);
        return full;
    }

    public void Dispose()
    {
        try
        {
            Directory.Delete(Path, recursive: true);
        }
        catch (IOException)
        {
            // A file still open elsewhere: the temp folder is cleaned by the system later.
        }
    }
}
