using System.Diagnostics;
using FitSpec.Diagnostics;
using FitSpec.Reporting;
using FitSpec.Results;
using FitSpec.Solving;
using FitSpec.Spec;

namespace FitSpec.Pipeline.Batch;

/// <summary>
/// Runs a batch: every spec in parallel (up to Jobs at once), each either taken from the cache or run and
/// written, one fit's failure never stopping the others. Results come back in the order of the specs.
/// A cancelled run still returns one result per spec: the fits it stopped or never started are
/// <see cref="FitSource.Cancelled"/>, with nothing written or cached for them.
/// </summary>
public static class BatchRunner
{
    /// <summary>The name the run's own index pages take in the out folder; no fit may use it.</summary>
    public const string IndexName = "index";

    /// <param name="request">What to run.</param>
    /// <param name="finished">Called once per fit as it finishes, one call at a time, with the count done so far.</param>
    /// <param name="cancellation">Stops starting new fits and is passed to the solves under way.</param>
    /// <param name="solving">
    /// Called with a fit's name and its solve's progress while a long solve runs (from the solving thread;
    /// several fits may report at once).
    /// </param>
    public static IReadOnlyList<FitRun> Run(BatchRequest request, Action<FitRun, int>? finished = null, CancellationToken cancellation = default, Action<string, SolveProgress>? solving = null)
    {
        ArgumentNullException.ThrowIfNull(request);
        // An out folder that cannot be written ends the run before any fit is solved for nothing.
        OutFolderProbe.Check(request.OutDir);
        StaleTemps.Sweep(request.OutDir);
        var specs = request.Specs;
        var cache = new FitCache(request.OutDir);
        var context = KeyContext.For(request.Formats, request.Settings.Stamp);
        var reads = new SpecReadResult[specs.Count];
        // No token here: a cancelled batch still goes through every spec, to mark those it did not run.
        var parallel = new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, request.Jobs) };
        // Confined before the cache key is computed: a spec that may not read a file never has it hashed either.
        Parallel.For(0, specs.Count, parallel, i => reads[i] = PathConfinement.Apply(SpecReader.Read(specs[i]), request.Settings.AllowOutsidePaths));
        var clashes = NameClashes(specs, reads);

        var runs = new FitRun[specs.Count];
        var keys = new string?[specs.Count];
        var gate = new object();
        var done = 0;
        Parallel.For(0, specs.Count, parallel, i =>
        {
            var clock = Stopwatch.StartNew();
            FitRun run;
            if (cancellation.IsCancellationRequested)
            {
                run = CancelledRun(specs[i], reads[i].Name, started: false, clock);
            }
            else if (clashes.TryGetValue(i, out var clash))
            {
                // Its files would overwrite another fit's (or the index pages): report it, write nothing.
                run = new FitRun(ClashSummary(specs[i], reads[i].Name, clash), FitSource.Skipped, [], [], clock.Elapsed);
            }
            else
            {
                try
                {
                    var key = CacheKey.Compute(specs[i], reads[i], context);
                    keys[i] = key.Value;
                    using var progress = SolveProgressScope.Enter(solving is null ? null : new FitProgress(reads[i].Name, solving));
                    run = RunOne(specs[i], reads[i], key, request, cache, clock, cancellation);
                }
                catch (OperationCanceledException) when (cancellation.IsCancellationRequested)
                {
                    run = CancelledRun(specs[i], reads[i].Name, started: true, clock);
                }
                catch (Exception e) when (e is not OperationCanceledException)
                {
                    // A bug here must cost this fit only, never the batch.
                    var message = $"internal error while running this fit ({e.GetType().Name}: {e.Message}); this is a bug in FitSpec, please report it with the spec and data";
                    run = new FitRun(ErrorSummary(specs[i], reads[i].Name, message), FitSource.Solved, [], [$"{specs[i]}: error: {message}"], clock.Elapsed);
                }
            }

            runs[i] = run;
            lock (gate)
            {
                done++;
                finished?.Invoke(run, done);
            }
        });

        try
        {
            // A cancelled fit's files, and those of a fit that could not write its new ones, are as an earlier
            // run left them, so its entries still describe them.
            cache.Prune(
                keys.Where(k => k is not null).Select(k => k!).ToHashSet(StringComparer.Ordinal),
                runs.Where(r => r.Source != FitSource.Cancelled && r.Problems.Count == 0).Select(r => r.Summary.Name).ToHashSet(StringComparer.Ordinal));
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            // Pruning only saves space; the next run tries again.
        }

        return runs;
    }

    private static FitRun RunOne(string spec, SpecReadResult read, FitKey key, BatchRequest request, FitCache cache, Stopwatch clock, CancellationToken cancellation)
    {
        if (!request.Force && cache.Find(key.Value) is { } hit)
        {
            return new FitRun(hit.Summary, FitSource.Cached, hit.Outputs.Select(o => o.Path).ToList(), [], clock.Elapsed);
        }

        var outcome = FitRunner.RunForOutput(spec, read, request.Settings, cancellation);
        // Whatever a fit returns once the run is cancelled may be cut short (a stage that turned the stop into
        // an error or a limit): it is neither written nor cached.
        cancellation.ThrowIfCancellationRequested();
        var result = outcome.Result;
        var summary = FitSummary.Of(result);
        IReadOnlyList<string> written;
        try
        {
            written = OutputWriter.Write(result, request.OutDir, request.Formats.Count > 0 ? request.Formats : outcome.Formats, outcome.TemplateFolder);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return new FitRun(summary, FitSource.Solved, [], [$"{request.OutDir}: error: cannot write the results of '{result.Name}': {WriteFailure.Message(e)}"], clock.Elapsed);
        }
        catch (ReportTemplateException e)
        {
            return new FitRun(summary, FitSource.Solved, [], [$"{spec}: error: report template: {e.Message.ReplaceLineEndings(" ")}"], clock.Elapsed);
        }

        var outputs = written.Select(cache.RelativePath).ToList();
        if (!SameInputs(key, result))
        {
            // The spec or data changed while the fit ran: the files are right for what was read, but the key is not.
            return new FitRun(summary, FitSource.Solved, outputs, [], clock.Elapsed);
        }

        try
        {
            cache.Store(key.Value, summary, written);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            // Without an entry the fit is solved again next time; its files are written, so nothing is lost.
        }

        return new FitRun(summary, FitSource.Solved, outputs, [], clock.Elapsed);
    }

    // The runner read the spec (and data) itself; the result's own hashes say whether it saw what the key hashed.
    private static bool SameInputs(FitKey key, FitResult result) =>
        string.Equals(result.Provenance.SpecSha256, key.SpecSha256, StringComparison.Ordinal)
        && (result.Data is null || string.Equals(result.Data.Sha256, key.DataSha256, StringComparison.Ordinal));

    // Fit names must be unique in one out folder, and 'index' is the run's own: a clashing spec is refused.
    private static Dictionary<int, string> NameClashes(IReadOnlyList<string> specs, SpecReadResult[] reads)
    {
        var firstByName = new Dictionary<string, int>(StringComparer.Ordinal);
        var clashes = new Dictionary<int, string>();
        for (var i = 0; i < specs.Count; i++)
        {
            var name = reads[i].Name;
            if (string.Equals(name, IndexName, StringComparison.Ordinal))
            {
                clashes[i] = $"fit name '{name}' is taken by the run's index pages ({IndexName}.html, {IndexName}.md) in the out folder; set another 'name:'";
            }
            else if (!firstByName.TryAdd(name, i))
            {
                clashes[i] = $"fit name '{name}' is also the name of {specs[firstByName[name]]}; names must be unique in one run (set 'name:')";
            }
        }

        return clashes;
    }

    private static FitRun CancelledRun(string spec, string name, bool started, Stopwatch clock)
    {
        var detail = started
            ? "stopped while it ran; nothing was written for it"
            : "not started; nothing was written for it";
        var summary = new FitSummary(name, null, spec, "cancelled", detail, CancelledExitCode, 0, 0, null, null, null, null, null, []);
        return new FitRun(summary, FitSource.Cancelled, [], [], clock.Elapsed);
    }

    /// <summary>The exit code of a cancelled fit (and of a cancelled run): 128 + SIGINT, as shells report it.</summary>
    public const int CancelledExitCode = 130;

    /// <summary>Passes one fit's solve progress on with the fit's name.</summary>
    private sealed class FitProgress(string name, Action<string, SolveProgress> solving) : IProgress<SolveProgress>
    {
        public void Report(SolveProgress value) => solving(name, value);
    }

    private static FitSummary ClashSummary(string spec, string name, string message) =>
        ErrorSummary(spec, name, message) with { Errors = [new Diagnostic(spec, null, null, "name", message).ToString()] };

    private static FitSummary ErrorSummary(string spec, string name, string message) =>
        new(name, null, spec, "error", message, 2, 0, 0, null, null, null, null, null, []);
}
