using System.Diagnostics;
using FitSpec.Tests.Cli;

namespace FitSpec.Tests.Faults;

/// <summary>What a `fitspec` process that was killed printed before it died, and how it ended.</summary>
public sealed record KilledRun(int Pid, int ExitCode, IReadOnlyList<string> StdoutLines, string Stderr)
{
    /// <summary>Exit status of a process ended by SIGKILL, as the runtime reports it (128 + 9).</summary>
    public const int SigkillExitCode = 137;

    public string Stdout => string.Join('\n', StdoutLines);

    public override string ToString() => $"pid {Pid}, exit {ExitCode}{Environment.NewLine}stdout:{Environment.NewLine}{Stdout}{Environment.NewLine}stderr:{Environment.NewLine}{Stderr}";

    /// <summary>
    /// Runs `fitspec ARGS` in <paramref name="folder"/> and sends it SIGKILL as soon as the stdout lines seen so
    /// far satisfy <paramref name="killWhen"/>: the kill follows what the run did, not a guessed delay. A run
    /// that ends by itself first is returned as it ended (its exit code is then not 137).
    /// </summary>
    public static KilledRun Start(string folder, Func<IReadOnlyList<string>, bool> killWhen, params string[] args)
    {
        ArgumentNullException.ThrowIfNull(killWhen);
        var info = new ProcessStartInfo(CliHost.Dotnet())
        {
            WorkingDirectory = folder,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add(CliHarness.FitspecDll);
        foreach (var a in args)
        {
            info.ArgumentList.Add(a);
        }

        using var process = Process.Start(info) ?? throw new InvalidOperationException("could not start fitspec");
        var pid = process.Id;
        var stderr = process.StandardError.ReadToEndAsync();
        var lines = new List<string>();
        using var due = new ManualResetEventSlim();
        var reader = Task.Run(() =>
        {
            while (process.StandardOutput.ReadLine() is { } line)
            {
                lock (lines)
                {
                    lines.Add(line);
                    if (killWhen(lines))
                    {
                        due.Set();
                    }
                }
            }

            due.Set(); // end of output: the process ended by itself
        });

        var inTime = due.Wait(TimeSpan.FromSeconds(40));
        // Process.Kill on Linux is kill(pid, SIGKILL): no handler runs, no finally block, no flush.
        process.Kill();
        if (!process.WaitForExit(20_000))
        {
            throw new TimeoutException("fitspec did not end within 20 s of SIGKILL");
        }

        reader.Wait(TimeSpan.FromSeconds(20));
        if (!inTime)
        {
            throw new TimeoutException("the condition to kill fitspec was not met within 40 s; stdout so far:" + Environment.NewLine + string.Join(Environment.NewLine, lines));
        }

        lock (lines)
        {
            return new KilledRun(pid, process.ExitCode, lines.ToList(), stderr.GetAwaiter().GetResult());
        }
    }
}
