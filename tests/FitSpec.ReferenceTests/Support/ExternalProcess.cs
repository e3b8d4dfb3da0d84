using System.Diagnostics;

namespace FitSpec.ReferenceTests.Support;

/// <summary>What one external process run produced.</summary>
public sealed record ProcessOutcome(int ExitCode, string Stdout, string Stderr)
{
    public override string ToString() => $"exit {ExitCode}{Environment.NewLine}stdout:{Environment.NewLine}{Stdout}stderr:{Environment.NewLine}{Stderr}";
}

/// <summary>Runs external programs: the built <c>fitspec</c> CLI (copied next to this assembly) and other tools.</summary>
public static class ExternalProcess
{
    /// <summary>The CLI assembly the test project copies next to itself (it references the CLI project).</summary>
    public static string FitspecDll { get; } = Path.Combine(AppContext.BaseDirectory, "fitspec.dll");

    /// <summary><c>dotnet fitspec.dll ARGS</c> in <paramref name="workingDirectory"/>.</summary>
    public static ProcessOutcome Fitspec(string workingDirectory, params string[] args) =>
        Run(DotnetHost(), workingDirectory, [FitspecDll, .. args]);

    public static ProcessOutcome Run(string program, string workingDirectory, IEnumerable<string> args, int timeoutMs = 60_000)
    {
        var info = new ProcessStartInfo(program)
        {
            WorkingDirectory = workingDirectory,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        foreach (var a in args)
        {
            info.ArgumentList.Add(a);
        }

        using var process = Process.Start(info) ?? throw new InvalidOperationException($"could not start {program}");
        var stderr = process.StandardError.ReadToEndAsync();
        var stdout = process.StandardOutput.ReadToEnd();
        if (!process.WaitForExit(timeoutMs))
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException($"{program} {string.Join(' ', args)} did not finish within {timeoutMs} ms");
        }

        return new ProcessOutcome(process.ExitCode, stdout, stderr.GetAwaiter().GetResult());
    }

    /// <summary>Finds an executable on PATH; null when absent.</summary>
    public static string? OnPath(string name)
    {
        var path = Environment.GetEnvironmentVariable("PATH") ?? "";
        foreach (var dir in path.Split(Path.PathSeparator, StringSplitOptions.RemoveEmptyEntries))
        {
            var candidate = Path.Combine(dir, name);
            if (File.Exists(candidate))
            {
                return candidate;
            }
        }

        return null;
    }

    private static string DotnetHost()
    {
        var host = Environment.GetEnvironmentVariable("DOTNET_HOST_PATH");
        if (!string.IsNullOrEmpty(host) && File.Exists(host))
        {
            return host;
        }

        var self = Environment.ProcessPath;
        if (self is not null && Path.GetFileNameWithoutExtension(self) == "dotnet")
        {
            return self;
        }

        return "dotnet";
    }
}
