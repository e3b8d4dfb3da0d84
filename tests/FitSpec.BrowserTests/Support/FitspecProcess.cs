using System.Diagnostics;

namespace FitSpec.BrowserTests.Support;

/// <summary>What one run of the CLI produced.</summary>
public sealed record FitspecRun(int ExitCode, string Stdout, string Stderr)
{
    public override string ToString() => $"exit {ExitCode}{Environment.NewLine}stdout:{Environment.NewLine}{Stdout}stderr:{Environment.NewLine}{Stderr}";
}

/// <summary>
/// Runs the built CLI as a user would (`dotnet fitspec.dll ...`; the dll is copied next to this assembly
/// because the project references the CLI project).
/// </summary>
public static class FitspecProcess
{
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

    public static async Task<FitspecRun> RunAsync(string workingDirectory, params string[] args)
    {
        var info = new ProcessStartInfo(DotnetHost())
        {
            WorkingDirectory = workingDirectory,
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
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        using var limit = new CancellationTokenSource(TimeSpan.FromSeconds(120));
        try
        {
            await process.WaitForExitAsync(limit.Token);
        }
        catch (OperationCanceledException)
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException("fitspec " + string.Join(' ', args) + " did not finish within 120 s");
        }

        return new FitspecRun(process.ExitCode, await stdout, await stderr);
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
