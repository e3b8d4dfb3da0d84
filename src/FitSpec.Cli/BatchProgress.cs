using FitSpec.Pipeline.Batch;
using Spectre.Console;
using Spectre.Console.Rendering;

namespace FitSpec.Cli;

/// <summary>Shows a batch's progress while <c>work</c> runs it; work reports each finished fit with the count done.</summary>
internal interface IBatchProgress
{
    IReadOnlyList<FitRun> Show(int total, Func<Action<FitRun, int>, IReadOnlyList<FitRun>> work);
}

/// <summary>For pipes and CI logs: one plain line per finished fit, in the order they finish.</summary>
internal sealed class PlainProgress(TextWriter output) : IBatchProgress
{
    public IReadOnlyList<FitRun> Show(int total, Func<Action<FitRun, int>, IReadOnlyList<FitRun>> work) =>
        work((run, done) =>
        {
            try
            {
                output.WriteLine(FitLines.Progress(run, done, total));
                output.Flush();
            }
            catch (IOException)
            {
                // A reader that went away (`| head`) must not stop the fits; their files still get written.
            }
        });
}

/// <summary>For an interactive terminal: a live bar with done/total, elapsed and remaining time.</summary>
internal sealed class BarProgress(IAnsiConsole console) : IBatchProgress
{
    public IReadOnlyList<FitRun> Show(int total, Func<Action<FitRun, int>, IReadOnlyList<FitRun>> work)
    {
        IReadOnlyList<FitRun> runs = [];
        console.Progress()
            .AutoClear(false)
            .HideCompleted(false)
            .Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new CountColumn(), new ElapsedTimeColumn(), new RemainingTimeColumn())
            .Start(context =>
            {
                var task = context.AddTask("fits", autoStart: true, maxValue: Math.Max(1, total));
                runs = work((_, _) => task.Increment(1));
            });
        return runs;
    }

    /// <summary>done/total as whole numbers.</summary>
    private sealed class CountColumn : ProgressColumn
    {
        public override IRenderable Render(RenderOptions options, ProgressTask task, TimeSpan deltaTime) =>
            new Text(FormattableString.Invariant($"{task.Value:0}/{task.MaxValue:0}"));
    }
}
