using System.Collections.Concurrent;
using FitSpec.Pipeline.Batch;
using FitSpec.Solving;
using Spectre.Console;
using Spectre.Console.Rendering;

namespace FitSpec.Cli;

/// <summary>
/// Shows a batch's progress while <c>work</c> runs it. Work gets where to report each finished fit (with the
/// count done) and, when the display shows them, where long fits report their solve's progress (null: not shown).
/// </summary>
internal interface IBatchProgress
{
    IReadOnlyList<FitRun> Show(int total, Func<Action<FitRun, int>, Action<string, SolveProgress>?, IReadOnlyList<FitRun>> work);

    /// <summary>Says that the run is being cancelled and waits for its fits to stop (any thread).</summary>
    void Cancelling();
}

/// <summary>
/// For pipes and CI logs: one plain line per finished fit, in the order they finish. Long solves' progress is
/// not shown, so that a log holds the same lines however long the fits took.
/// </summary>
internal sealed class PlainProgress(TextWriter output, TextWriter error) : IBatchProgress
{
    public IReadOnlyList<FitRun> Show(int total, Func<Action<FitRun, int>, Action<string, SolveProgress>?, IReadOnlyList<FitRun>> work) =>
        work(
            (run, done) =>
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
            },
            null);

    public void Cancelling()
    {
        try
        {
            error.WriteLine($"fitspec: {FitLines.Cancelling}");
            error.Flush();
        }
        catch (IOException)
        {
        }
    }
}

/// <summary>
/// For an interactive terminal: a live bar with done/total, elapsed and remaining time, and under it a line
/// for each fit whose solve has run long (see <see cref="SolveProgress.QuietSeconds"/>).
/// </summary>
internal sealed class BarProgress(IAnsiConsole console) : IBatchProgress
{
    private readonly LongSolves _solves = new();

    public IReadOnlyList<FitRun> Show(int total, Func<Action<FitRun, int>, Action<string, SolveProgress>?, IReadOnlyList<FitRun>> work)
    {
        IReadOnlyList<FitRun> runs = [];
        console.Progress()
            .AutoClear(false)
            .HideCompleted(false)
            .Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new CountColumn(), new ElapsedTimeColumn(), new RemainingTimeColumn())
            .UseRenderHook((bar, _) => WithSolves(bar))
            .Start(context =>
            {
                var task = context.AddTask("fits", autoStart: true, maxValue: Math.Max(1, total));
                runs = work(
                    (run, _) =>
                    {
                        _solves.Finished(run.Summary.Name);
                        task.Increment(1);
                    },
                    _solves.Report);
            });
        return runs;
    }

    public void Cancelling() => _solves.Cancelling = true;

    /// <summary>The bar with a line under it for each long solve under way (and the cancel notice).</summary>
    internal IRenderable WithSolves(IRenderable bar)
    {
        var lines = _solves.Lines();
        return lines.Count == 0 ? bar : new Rows([bar, .. lines.Select(l => new Text(l, new Style(Color.Grey)))]);
    }

    /// <summary>done/total as whole numbers.</summary>
    private sealed class CountColumn : ProgressColumn
    {
        public override IRenderable Render(RenderOptions options, ProgressTask task, TimeSpan deltaTime) =>
            new Text(FormattableString.Invariant($"{task.Value:0}/{task.MaxValue:0}"));
    }
}

/// <summary>
/// For one fit on an interactive terminal: a status line updated in place while it runs (its solve's progress
/// once that has run long), gone when it ends.
/// </summary>
internal sealed class StatusLineProgress(IAnsiConsole console) : IBatchProgress
{
    private readonly LongSolves _solves = new();
    private volatile StatusContext? _context;

    public IReadOnlyList<FitRun> Show(int total, Func<Action<FitRun, int>, Action<string, SolveProgress>?, IReadOnlyList<FitRun>> work)
    {
        IReadOnlyList<FitRun> runs = [];
        console.Status().Start(Markup.Escape(Line()), context =>
        {
            _context = context;
            runs = work(
                (run, _) => _solves.Finished(run.Summary.Name),
                (name, progress) =>
                {
                    _solves.Report(name, progress);
                    Update();
                });
        });
        _context = null;
        return runs;
    }

    public void Cancelling()
    {
        _solves.Cancelling = true;
        Update();
    }

    /// <summary>What the status line says now: the cancel notice once cancelled, else the fit's progress.</summary>
    internal string Line() => _solves.Cancelling ? FitLines.Cancelling
        : _solves.Lines() is { Count: > 0 } lines ? string.Join("; ", lines)
        : "running";

    private void Update()
    {
        if (_context is { } context)
        {
            context.Status = Markup.Escape(Line());
        }
    }
}

/// <summary>The latest progress of each fit whose solve reports it, until the fit finishes (thread-safe).</summary>
internal sealed class LongSolves
{
    private readonly ConcurrentDictionary<string, SolveProgress> _running = new(StringComparer.Ordinal);
    private volatile bool _cancelling;

    public bool Cancelling
    {
        get => _cancelling;
        set => _cancelling = value;
    }

    public void Report(string name, SolveProgress progress) => _running[name] = progress;

    public void Finished(string name) => _running.TryRemove(name, out _);

    /// <summary>One line per long solve, by name; the cancel notice last.</summary>
    public IReadOnlyList<string> Lines()
    {
        var lines = _running.OrderBy(p => p.Key, StringComparer.Ordinal).Select(p => FitLines.Solving(p.Key, p.Value)).ToList();
        if (_cancelling)
        {
            lines.Add(FitLines.Cancelling);
        }

        return lines;
    }
}
