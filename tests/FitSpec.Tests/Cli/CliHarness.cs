using System.Diagnostics;
using System.Text.Json;

namespace FitSpec.Tests.Cli;

/// <summary>What one run of the CLI produced.</summary>
public sealed record CliRun(int ExitCode, string Stdout, string Stderr)
{
    public string[] StderrLines => Stderr.Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);

    public override string ToString() => $"exit {ExitCode}{Environment.NewLine}stdout:{Environment.NewLine}{Stdout}stderr:{Environment.NewLine}{Stderr}";
}

/// <summary>
/// A temporary folder to run the built CLI in (`dotnet fitspec.dll ...`; the dll is copied next to this
/// assembly because the test project references the CLI project).
/// </summary>
public sealed class CliHarness : IDisposable
{
    public CliHarness()
    {
        Folder = Path.Combine(Path.GetTempPath(), "fitspec-cli-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(Folder);
    }

    public string Folder { get; }

    public static string FitspecDll { get; } = Path.Combine(AppContext.BaseDirectory, "fitspec.dll");

    /// <summary>The repository root: the nearest folder above this assembly holding FitSpec.sln.</summary>
    public static string RepositoryRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "FitSpec.sln")))
            {
                return dir.FullName;
            }
        }

        throw new InvalidOperationException("FitSpec.sln not found above " + AppContext.BaseDirectory);
    }

    /// <summary>Writes a file (path relative to the folder, sub-folders created); returns the relative path.</summary>
    public string Write(string relative, string text)
    {
        var full = Path.Combine(Folder, relative);
        Directory.CreateDirectory(Path.GetDirectoryName(full)!);
        File.WriteAllText(full, text);
        return relative;
    }

    public string Read(string relative) => File.ReadAllText(Path.Combine(Folder, relative));

    public bool Exists(string relative) => File.Exists(Path.Combine(Folder, relative));

    public JsonElement Json(string relative) => JsonDocument.Parse(Read(relative)).RootElement;

    /// <summary>
    /// Runs `fitspec ARGS` with the folder as working directory. Every run must be free of stack traces:
    /// errors are one-line messages, never an exception dump.
    /// </summary>
    public CliRun Run(params string[] args)
    {
        var info = new ProcessStartInfo(DotnetHost())
        {
            WorkingDirectory = Folder,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add(FitspecDll);
        foreach (var a in args)
        {
            info.ArgumentList.Add(a);
        }

        using var process = Process.Start(info) ?? throw new InvalidOperationException("could not start dotnet");
        var stderr = process.StandardError.ReadToEndAsync();
        var stdout = process.StandardOutput.ReadToEnd();
        if (!process.WaitForExit(60_000))
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException("fitspec " + string.Join(' ', args) + " did not finish within 60 s");
        }

        var run = new CliRun(process.ExitCode, stdout, stderr.GetAwaiter().GetResult());
        Assert.False(run.Stderr.Contains("   at ", StringComparison.Ordinal) || run.Stderr.Contains("Exception", StringComparison.Ordinal),
            "stack trace or exception on stderr: " + run);
        return run;
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

    private static string DotnetHost()
    {
        var host = Environment.GetEnvironmentVariable("DOTNET_HOST_PATH");
        if (!string.IsNullOrEmpty(host) && File.Exists(host))
        {
            return host;
        }

        var self = Environment.ProcessPath;
        return self is not null && Path.GetFileNameWithoutExtension(self) == "dotnet" ? self : "dotnet";
    }
}
