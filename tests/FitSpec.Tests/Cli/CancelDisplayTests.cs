using System.Runtime.InteropServices;
using FitSpec.Cli;
using FitSpec.Pipeline.Batch;
using FitSpec.Solving;
using Spectre.Console;

namespace FitSpec.Tests.Cli;

/// <summary>
/// The solve command's side of progress and Ctrl-C, without a process: what a long fit's line says, that
/// redirected output asks for no progress at all, that the terminal display shows a long fit under the bar
/// until it finishes, and what the first Ctrl-C does.
/// </summary>
public sealed class CancelDisplayTests
{
    private static readonly SolveProgress Milp = new(TimeSpan.FromSeconds(12.34), 45210, 1, 42.125, 0.0052);

    [Fact]
    public void A_long_fit_line_gives_time_iterations_and_what_is_known()
    {
        Assert.Equal("lc7: solving 12.3 s, 45210 HiGHS iterations, objective 42.125, gap 0.52%", FitLines.Solving("lc7", Milp));
        Assert.Equal("lc7: solving 2.0 s, 1 HiGHS iteration, program 3", FitLines.Solving("lc7", new SolveProgress(TimeSpan.FromSeconds(2), 1, 3, null, null)));
    }

    /// <summary>Pipes and CI logs stay as they were: the plain display takes no solve progress.</summary>
    [Fact]
    public void Redirected_output_asks_for_no_solve_progress()
    {
        using var output = new StringWriter();
        using var error = new StringWriter();
        var asked = true;
        new PlainProgress(output, error).Show(1, (finished, solving) =>
        {
            asked = solving is not null;
            return [];
        });

        Assert.False(asked);
        Assert.Equal("", output.ToString());
    }

    [Fact]
    public void The_bar_shows_a_long_fit_under_it_until_the_fit_finishes()
    {
        var console = PlainConsole(out var text);
        var bar = new BarProgress(console);
        Action<string, SolveProgress>? report = null;
        bar.Show(2, (finished, solving) =>
        {
            report = solving;
            return [];
        });
        Assert.NotNull(report);

        report("lc7", Milp);
        console.Write(bar.WithSolves(new Text("the bar")));
        bar.Cancelling();
        console.Write(bar.WithSolves(new Text("the bar")));

        var lines = text.ToString().Split('\n', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries);
        Assert.Contains("lc7: solving 12.3 s, 45210 HiGHS iterations, objective 42.125, gap 0.52%", lines);
        Assert.Contains(FitLines.Cancelling, lines);
        Assert.Equal(lines.Length - 1, Array.LastIndexOf(lines, FitLines.Cancelling));
    }

    [Fact]
    public void A_finished_fit_leaves_the_status_line()
    {
        var solves = new LongSolves();
        solves.Report("b", Milp);
        solves.Report("a", Milp with { Iterations = 7 });
        Assert.Equal([FitLines.Solving("a", Milp with { Iterations = 7 }), FitLines.Solving("b", Milp)], solves.Lines());

        solves.Finished("a");
        Assert.Equal([FitLines.Solving("b", Milp)], solves.Lines());
        Assert.Equal("running", new StatusLineProgress(PlainConsole(out _)).Line());
    }

    /// <summary>The first Ctrl-C keeps the process alive, says so once, and cancels the run's token.</summary>
    [Fact]
    public void The_first_ctrl_c_cancels_the_run_and_keeps_the_process()
    {
        using var cancel = new CancellationTokenSource();
        var notices = 0;
        using var interruption = new Interruption(cancel, Path.GetTempPath(), () => notices++, () => { }, listen: false);
        var signal = new PosixSignalContext(PosixSignal.SIGINT);

        interruption.OnSignal(signal);

        Assert.True(signal.Cancel, "the process must not end on the first Ctrl-C");
        Assert.True(cancel.IsCancellationRequested);
        Assert.True(interruption.Cancelled);
        Assert.Equal(1, notices);
    }

    /// <summary>Before leaving on a second Ctrl-C, only this process's temp files are removed.</summary>
    [Fact]
    public void Leaving_removes_this_process_temp_files_only()
    {
        using var temp = new Support.TempFolder("fitspec-leave");
        var cache = Directory.CreateDirectory(Path.Combine(temp.Path, FitCache.FolderName)).FullName;
        var pid = Environment.ProcessId;
        var mine = temp.Write($".lc7.result.json.{pid}.0123abcd.tmp", "half");
        var mineInCache = Path.Combine(cache, $".key.json.{pid}.4567ef.tmp");
        File.WriteAllText(mineInCache, "half");
        var others = temp.Write($".lc7.md.{pid + 1}.89ab.tmp", "another run's");
        var result = temp.Write("lc7.result.json", "{}");

        Assert.Equal(2, Interruption.RemoveTempFiles(temp.Path));

        Assert.False(File.Exists(mine));
        Assert.False(File.Exists(mineInCache));
        Assert.True(File.Exists(others));
        Assert.True(File.Exists(result));
    }

    private static IAnsiConsole PlainConsole(out StringWriter text)
    {
        text = new StringWriter();
        var console = AnsiConsole.Create(new AnsiConsoleSettings
        {
            Ansi = AnsiSupport.No,
            ColorSystem = ColorSystemSupport.NoColors,
            Interactive = InteractionSupport.No,
            Out = new AnsiConsoleOutput(text),
        });
        console.Profile.Width = 200; // no wrapping of the lines compared
        return console;
    }
}
