using System.Text.Json;
using FitSpec.Pipeline;
using FitSpec.Results;

namespace FitSpec.ReferenceTests.Support;

/// <summary>A temporary folder holding a spec and a copy of its data, run through the whole pipeline.</summary>
public sealed class SpecWorkspace : IDisposable
{
    public SpecWorkspace()
    {
        Folder = Path.Combine(Path.GetTempPath(), "fitspec-ref-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(Folder);
    }

    public string Folder { get; }

    public string CopyData(string referenceRelative, string? asName = null)
    {
        var target = Path.Combine(Folder, asName ?? Path.GetFileName(referenceRelative));
        File.Copy(ReferenceData.PathOf(referenceRelative), target, overwrite: true);
        return Path.GetFileName(target);
    }

    public string WriteSpec(string name, string yaml)
    {
        var path = Path.Combine(Folder, name + ".fit.yaml");
        File.WriteAllText(path, yaml);
        return path;
    }

    /// <summary>Spec file → result.json through the real pipeline and writer; returns the parsed JSON.</summary>
    public JsonElement Solve(string specPath)
    {
        var result = FitRunner.Run(specPath);
        var outDir = Path.Combine(Folder, "out");
        OutputWriter.Write(result, outDir, [Spec.ReportFormat.Json], null);
        var json = File.ReadAllText(Path.Combine(outDir, result.Name + ".result.json"));
        return JsonDocument.Parse(json).RootElement;
    }

    public void Dispose()
    {
        try
        {
            Directory.Delete(Folder, recursive: true);
        }
        catch (IOException)
        {
        }
    }
}

public static class Lre
{
    /// <summary>Log relative error: -log10(|x - c| / |c|) (absolute when c = 0), capped at 15.</summary>
    public static double Of(double estimate, double certified)
    {
        var diff = Math.Abs(estimate - certified);
        if (diff == 0)
        {
            return 15;
        }

        var rel = certified == 0 ? diff : diff / Math.Abs(certified);
        return Math.Min(15, -Math.Log10(rel));
    }
}
