using System.Diagnostics;

namespace FitSpec.Tests.Faults;

/// <summary>Runs a system tool (mount, chattr) to set up a fault; returns its exit code and what it said.</summary>
public static class Command
{
    public static (int ExitCode, string Output) Run(string file, params string[] args)
    {
        var info = new ProcessStartInfo(file)
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        foreach (var a in args)
        {
            info.ArgumentList.Add(a);
        }

        try
        {
            using var process = Process.Start(info)!;
            var stderr = process.StandardError.ReadToEndAsync();
            var stdout = process.StandardOutput.ReadToEnd();
            if (!process.WaitForExit(20_000))
            {
                process.Kill();
                return (-1, $"{file} did not finish within 20 s");
            }

            return (process.ExitCode, (stdout + stderr.GetAwaiter().GetResult()).Trim());
        }
        catch (System.ComponentModel.Win32Exception e)
        {
            return (-1, $"{file}: {e.Message}");
        }
    }

    /// <summary>Runs the tool and fails the test with its output when it fails.</summary>
    public static void Check(string file, params string[] args)
    {
        var (exit, output) = Run(file, args);
        Assert.True(exit == 0, $"{file} {string.Join(' ', args)}: exit {exit}: {output}");
    }
}
