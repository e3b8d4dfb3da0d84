using System.Diagnostics;

namespace FitSpec.ClusterTests.Support;

/// <summary>What one finished process printed and returned.</summary>
public sealed record ProcessRun(int ExitCode, string Stdout, string Stderr)
{
    public override string ToString() => $"exit {ExitCode}{Environment.NewLine}stdout:{Environment.NewLine}{Stdout}stderr:{Environment.NewLine}{Stderr}";
}

/// <summary>Runs a program to its end with a time limit, capturing its output.</summary>
public static class Processes
{
    public static async Task<ProcessRun> RunAsync(string program, IEnumerable<string> args, string workingDirectory, TimeSpan limit, IReadOnlyDictionary<string, string?>? environment = null)
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

        // A null value removes the variable, so a child does not see what the test host happens to have set.
        foreach (var (key, value) in environment ?? new Dictionary<string, string?>())
        {
            if (value is null)
            {
                info.Environment.Remove(key);
            }
            else
            {
                info.Environment[key] = value;
            }
        }

        using var process = Process.Start(info) ?? throw new InvalidOperationException("could not start " + program);
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        using var deadline = new CancellationTokenSource(limit);
        try
        {
            await process.WaitForExitAsync(deadline.Token);
        }
        catch (OperationCanceledException)
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException($"{program} {string.Join(' ', info.ArgumentList)} did not finish within {limit.TotalSeconds} s");
        }

        return new ProcessRun(process.ExitCode, await stdout, await stderr);
    }
}
