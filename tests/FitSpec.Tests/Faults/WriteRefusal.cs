using FitSpec.Tests.Cli;

namespace FitSpec.Tests.Faults;

/// <summary>
/// How `fitspec solve` must report an out folder it cannot write: one line for the folder when it refuses any
/// file at all, else one plain line per thing not written.
/// </summary>
public static class WriteRefusal
{
    /// <summary>
    /// Exit 2; each fit in <paramref name="notWritten"/> has its progress line saying "files NOT written" and
    /// exactly one stderr line "OUT: error: cannot write the results of 'NAME': ..." naming the out folder as
    /// given; the only other stderr line allowed is the one about the index pages (required when
    /// <paramref name="indexRefused"/> is true). No stack trace: the harness checks every run for one.
    /// </summary>
    public static void AssertReported(CliRun run, string outArg, IReadOnlyCollection<string> notWritten, bool? indexRefused)
    {
        ArgumentNullException.ThrowIfNull(run);
        ArgumentNullException.ThrowIfNull(notWritten);
        Assert.True(run.ExitCode == 2, run.ToString());
        var progress = BatchSpecs.ProgressLines(run);
        var stderr = run.StderrLines.ToList();
        foreach (var name in notWritten)
        {
            Assert.Contains(", files NOT written", progress[name].Groups["rest"].Value, StringComparison.Ordinal);
            var prefix = $"{outArg}: error: cannot write the results of '{name}': ";
            var lines = stderr.Where(l => l.StartsWith(prefix, StringComparison.Ordinal)).ToList();
            Assert.True(lines.Count == 1, $"expected one line for {name}: {run}");
            stderr.Remove(lines[0]);
        }

        var index = stderr.Where(l => l.StartsWith($"{outArg}: error: cannot write the index pages: ", StringComparison.Ordinal)).ToList();
        if (indexRefused is { } refused)
        {
            Assert.True(refused == (index.Count == 1), run.ToString());
        }

        Assert.True(stderr.Count == index.Count && index.Count <= 1, "unexpected stderr lines: " + run);
        Assert.DoesNotContain(progress, p => !notWritten.Contains(p.Key) && p.Value.Groups["rest"].Value.Contains("NOT written", StringComparison.Ordinal));
    }

    /// <summary>
    /// An out folder refused before any fit ran: exit 2, stdout without a single fit's progress line, and stderr
    /// exactly one line "OUT: error: cannot write the out folder: REASON; choose another --out" naming the out
    /// folder as given and giving <paramref name="reason"/>. No stack trace: the harness checks every run for one.
    /// </summary>
    public static void AssertOutFolderRefused(CliRun run, string outArg, string reason)
    {
        ArgumentNullException.ThrowIfNull(run);
        Assert.True(run.ExitCode == 2, run.ToString());
        var line = Assert.Single(run.StderrLines);
        Assert.StartsWith($"{outArg}: error: cannot write the out folder: ", line, StringComparison.Ordinal);
        Assert.Contains(reason, line, StringComparison.Ordinal);
        Assert.EndsWith("; choose another --out", line, StringComparison.Ordinal);
        Assert.Empty(BatchSpecs.ProgressLines(run));
    }
}
