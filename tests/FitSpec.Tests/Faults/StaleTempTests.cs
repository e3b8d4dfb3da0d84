using System.Diagnostics;
using System.Globalization;
using FitSpec.Tests.Cli;
using static FitSpec.Tests.Cli.BatchSpecs;

namespace FitSpec.Tests.Faults;

/// <summary>
/// Temp files that a killed run left (".NAME.PID.GUID.tmp" of a process that is gone): the next run into the
/// folder removes them, so they do not pile up in the out folder and its cache with every run killed mid-write.
/// </summary>
public sealed class StaleTempTests
{
    /// <summary>The next run into the folder should remove the temps of processes that are no longer alive.</summary>
    [Fact]
    public void A_run_removes_the_temp_files_a_killed_run_left()
    {
        using var cli = new CliHarness();
        WriteBatch(cli, 2);
        var first = cli.Run("solve", "specs", "--out", "out");
        Assert.True(first.ExitCode == 0, first.ToString());
        var dead = DeadPid().ToString(CultureInfo.InvariantCulture);
        var stale = new[]
        {
            cli.Write($"out/.{Name(0)}.html.{dead}.{Guid.NewGuid():N}.tmp", "<!doctype html><html><body>cut sh"),
            cli.Write($"out/.fitspec-cache/.{new string('a', 64)}.json.{dead}.{Guid.NewGuid():N}.tmp", "{\"format\": \"fitspec-cache"),
        };
        foreach (var file in stale)
        {
            File.SetLastWriteTimeUtc(Path.Combine(cli.Folder, file), DateTime.UtcNow.AddHours(-2));
        }

        var second = cli.Run("solve", "specs", "--out", "out");

        Assert.True(second.ExitCode == 0, second.ToString());
        Assert.All(stale, f => Assert.False(cli.Exists(f), $"{f} is still there"));
    }

    // The id of a process that has just ended (not reused within the test's few seconds on a normal system).
    private static int DeadPid()
    {
        using var process = Process.Start("true") ?? throw new InvalidOperationException("could not start 'true'");
        process.WaitForExit();
        return process.Id;
    }
}
