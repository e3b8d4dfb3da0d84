namespace FitSpec.ClusterTests.Support;

/// <summary>A fresh folder under the system temp folder, removed on dispose.</summary>
public sealed class TempFolder : IDisposable
{
    public TempFolder(string label)
    {
        Path = System.IO.Path.Combine(System.IO.Path.GetTempPath(), $"fitspec-{label}-{Guid.NewGuid():N}");
        Directory.CreateDirectory(Path);
    }

    public string Path { get; }

    /// <summary>A subfolder, created.</summary>
    public string Sub(string name) => Directory.CreateDirectory(System.IO.Path.Combine(Path, name)).FullName;

    public void Dispose()
    {
        try
        {
            Directory.Delete(Path, recursive: true);
        }
        catch (IOException)
        {
            // A job still writing a log must not fail the test run; the temp folder is cleaned by the system.
        }
    }
}
