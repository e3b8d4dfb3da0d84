namespace FitSpec.Fuzz.Harness;

/// <summary>
/// A private folder for one worker thread: targets that must go through files (the CSV reader, full fits)
/// write their input here. The demo data is copied in once, so mutated demo specs find their CSV files.
/// </summary>
public sealed class Workspace : IDisposable
{
    private Workspace(string folder)
    {
        Folder = folder;
    }

    public string Folder { get; }

    public static Workspace Create(string root, int id, Corpus corpus)
    {
        ArgumentNullException.ThrowIfNull(corpus);
        var folder = Path.Combine(root, $"w{id}");
        Directory.CreateDirectory(folder);
        var data = Path.Combine(folder, "data");
        Directory.CreateDirectory(data);
        foreach (var (name, bytes) in corpus.DemoData)
        {
            File.WriteAllBytes(Path.Combine(data, name), bytes);
        }

        return new Workspace(folder);
    }

    /// <summary>Writes a file in this workspace and returns its full path.</summary>
    public string Write(string name, byte[] bytes)
    {
        var path = Path.Combine(Folder, name);
        File.WriteAllBytes(path, bytes);
        return path;
    }

    public string PathOf(string name) => Path.Combine(Folder, name);

    public void Dispose()
    {
        try
        {
            Directory.Delete(Folder, recursive: true);
        }
        catch (IOException)
        {
            // A leftover temp folder is harmless.
        }
        catch (UnauthorizedAccessException)
        {
            // Likewise.
        }
    }
}
