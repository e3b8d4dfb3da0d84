using System.Collections.Concurrent;
using System.Diagnostics;
using System.Security.Cryptography;
using System.Text;
using System.Text.RegularExpressions;
using CsCheck;

namespace FitSpec.Fuzz.Harness;

/// <summary>How a campaign runs: how many inputs, from which seed, where findings go.</summary>
public sealed record CampaignOptions
{
    public int Count { get; init; } = 1000;

    /// <summary>Input i is generated from (Seed, i) alone, so a run is repeatable and independent of threading.</summary>
    public ulong Seed { get; init; } = 1;

    public int Threads { get; init; } = Environment.ProcessorCount;

    /// <summary>CsCheck iterations spent shrinking each distinct failure.</summary>
    public int ShrinkIterations { get; init; } = 5000;

    /// <summary>Time spent removing bytes from each shrunk failure.</summary>
    public TimeSpan MinimizeTime { get; init; } = TimeSpan.FromSeconds(30);

    /// <summary>Distinct failures (by signature) that are shrunk and saved; the rest are only counted.</summary>
    public int MaxFindings { get; init; } = 5;

    /// <summary>Where findings are saved (null: not saved).</summary>
    public string? FindingsFolder { get; init; }

    /// <summary>
    /// An input still running after this long is saved as a hang and the process exits (a thread cannot be
    /// stopped from outside, so a true hang ends the run). Null: no watchdog (tests bound time themselves).
    /// </summary>
    public TimeSpan? HangLimit { get; init; }

    /// <summary>Writes each input to an 'inflight' folder before running it, so a crash of the whole process
    /// (a stack overflow, a native fault) leaves the input that caused it behind.</summary>
    public bool TraceInputs { get; init; }

    /// <summary>Multiplies every target's time budget (CI machines shared with other jobs get more slack).</summary>
    public double TimeScale { get; init; } = 1;

    public Action<string>? Log { get; init; }
}

/// <summary>One distinct failure: how often it happened, the first input, the shrunk one, and where it was saved.</summary>
public sealed record Finding(
    FailureKind Kind,
    string Signature,
    string Message,
    string Detail,
    long Occurrences,
    string Seed,
    FuzzCase First,
    FuzzCase Shrunk,
    string? SavedTo);

/// <summary>The counts of one campaign.</summary>
public sealed record CampaignReport(
    string Target,
    long Inputs,
    long Results,
    long CleanErrors,
    long Failures,
    long FullFits,
    IReadOnlyDictionary<string, long> Tally,
    IReadOnlyList<Finding> Findings,
    TimeSpan Elapsed,
    TimeSpan Slowest)
{
    public string Summary() =>
        $"{Target}: {Inputs} inputs ({FullFits} full fits) in {Elapsed.TotalSeconds:0.0} s: {Results} results, {CleanErrors} clean errors, "
        + $"{Failures} failures; slowest input {Slowest.TotalMilliseconds:0} ms";
}

/// <summary>
/// Runs N generated inputs of one target, in parallel, each from its own seed; counts how each ended; then
/// shrinks every distinct failure (CsCheck's shrinking from the failing seed, then byte removal) and saves it.
/// </summary>
public static partial class Campaign
{
    public static CampaignReport Run(IFuzzTarget target, Corpus corpus, CampaignOptions options)
    {
        ArgumentNullException.ThrowIfNull(target);
        ArgumentNullException.ThrowIfNull(corpus);
        ArgumentNullException.ThrowIfNull(options);
        var log = options.Log ?? (_ => { });
        var root = Path.Combine(WorkRoot(), $"fitspec-fuzz-{Environment.ProcessId}-{target.Name}-{Guid.NewGuid():N}");
        var slots = 0;
        using var workspaces = new ThreadLocal<Workspace>(() => Workspace.Create(root, Interlocked.Increment(ref slots), corpus), trackAllValues: true);
        var tally = new Tally();
        var failures = new ConcurrentDictionary<string, FailureRecord>(StringComparer.Ordinal);
        var running = new ConcurrentDictionary<int, InFlight>();
        long results = 0, clean = 0, failed = 0, fullFits = 0, slowestTicks = 0;
        var stream = StreamOf(target.Name);
        var inflightFolder = options.TraceInputs ? Path.Combine(root, "inflight") : null;
        if (inflightFolder is not null)
        {
            Directory.CreateDirectory(inflightFolder);
            log($"{target.Name}: each input is written to {inflightFolder} before it runs (left there if the process dies)");
        }

        using var watchdog = options.HangLimit is { } limit ? StartWatchdog(target, options, running, limit, log) : null;
        var clock = Stopwatch.StartNew();
        try
        {
            Parallel.For(0, options.Count, new ParallelOptions { MaxDegreeOfParallelism = options.Threads }, i =>
            {
                var pcg = new PCG(stream, Mix(options.Seed, (ulong)i));
                var seed = pcg.ToString(pcg.State);
                var input = target.Inputs.Generate(pcg, null, out _);
                if (input.Pipeline)
                {
                    Interlocked.Increment(ref fullFits);
                }

                var thread = Environment.CurrentManagedThreadId;
                if (inflightFolder is not null)
                {
                    File.WriteAllBytes(Path.Combine(inflightFolder, $"{target.Name}-{thread}{target.FileExtension}"), input.Data);
                    File.WriteAllText(Path.Combine(inflightFolder, $"{target.Name}-{thread}.txt"), $"input {i} (started {DateTime.UtcNow:HH:mm:ss.fff} UTC): {Describe(target, input, seed)}");
                }

                running[thread] = new InFlight(Stopwatch.GetTimestamp(), input, seed);
                var probe = Probe.Run(target, input, workspaces.Value!, tally, options.TimeScale);
                running.TryRemove(thread, out _);
                InterlockedMax(ref slowestTicks, probe.Elapsed.Ticks);
                if (probe.Failure is { } failure)
                {
                    Interlocked.Increment(ref failed);
                    failures.AddOrUpdate(
                        failure.Signature,
                        _ => new FailureRecord(i, seed, input, failure),
                        (_, old) => old.Index <= i ? old with { Count = old.Count + 1 } : new FailureRecord(i, seed, input, failure) { Count = old.Count + 1 });
                }
                else if (probe.Outcome == Outcome.Result)
                {
                    Interlocked.Increment(ref results);
                }
                else
                {
                    Interlocked.Increment(ref clean);
                }
            });
            var elapsed = clock.Elapsed;

            var findings = new List<Finding>();
            foreach (var record in failures.Values.OrderBy(r => r.Index).Take(options.MaxFindings))
            {
                log($"{target.Name}: shrinking {record.Failure.Signature} ({record.Count} inputs)");
                findings.Add(Shrink(target, options, workspaces, record));
            }

            foreach (var record in failures.Values.OrderBy(r => r.Index).Skip(options.MaxFindings))
            {
                findings.Add(new Finding(record.Failure.Kind, record.Failure.Signature, record.Failure.Message, record.Failure.Detail, record.Count, record.Seed, record.Input, record.Input, null));
            }

            return new CampaignReport(target.Name, options.Count, results, clean, failed, fullFits, tally.Snapshot(), findings, elapsed, TimeSpan.FromTicks(slowestTicks));
        }
        finally
        {
            foreach (var workspace in workspaces.Values)
            {
                workspace.Dispose();
            }

            try
            {
                Directory.Delete(root, recursive: true);
            }
            catch (DirectoryNotFoundException)
            {
                // Nothing was written.
            }
        }
    }

    /// <summary>Runs one saved input through a target (for checking a finding or a fix by hand).</summary>
    public static ProbeResult Replay(IFuzzTarget target, Corpus corpus, FuzzCase input)
    {
        ArgumentNullException.ThrowIfNull(target);
        var root = Path.Combine(WorkRoot(), $"fitspec-fuzz-replay-{Environment.ProcessId}-{Guid.NewGuid():N}");
        using var workspace = Workspace.Create(root, 0, corpus);
        try
        {
            return Probe.Run(target, input, workspace, new Tally());
        }
        finally
        {
            Directory.Delete(root, recursive: true);
        }
    }

    private static Finding Shrink(IFuzzTarget target, CampaignOptions options, ThreadLocal<Workspace> workspaces, FailureRecord record)
    {
        var signature = record.Failure.Signature;
        var scratch = new Tally();
        bool SameFailure(FuzzCase input) => Probe.Run(target, input, workspaces.Value!, scratch, options.TimeScale).Failure?.Signature == signature;

        // CsCheck starts from the failing seed and keeps any smaller generated input that fails the same way.
        var shrunk = record.Input;
        var seed = record.Seed;
        var iterations = record.Failure.Kind is FailureKind.Slow or FailureKind.Memory ? Math.Min(options.ShrinkIterations, 200) : options.ShrinkIterations;
        try
        {
            target.Inputs.Sample(
                input =>
                {
                    if (SameFailure(input))
                    {
                        throw new ContractViolation("still failing");
                    }
                },
                seed: seed,
                iter: iterations,
                threads: 1,
                print: input => input.Preview(200));
        }
        catch (CsCheckException e) when (SeedOf(e.Message) is { } smaller)
        {
            seed = smaller;
            shrunk = target.Inputs.Generate(PCG.Parse(smaller), null, out _);
        }

        var bytes = Minimizer.Minimize(shrunk.Data, data => SameFailure(shrunk with { Data = data }), options.MinimizeTime, 20_000);
        shrunk = shrunk with { Data = bytes };
        var saved = options.FindingsFolder is { } folder ? Save(folder, target, record, shrunk, seed) : null;
        return new Finding(record.Failure.Kind, signature, record.Failure.Message, record.Failure.Detail, record.Count, seed, record.Input, shrunk, saved);
    }

    private static string Save(string folder, IFuzzTarget target, FailureRecord record, FuzzCase shrunk, string seed)
    {
        var hash = Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(record.Failure.Signature)))[..10];
        var dir = Path.Combine(folder, target.Name, $"{record.Failure.Kind.ToString().ToLowerInvariant()}-{hash}");
        Directory.CreateDirectory(dir);
        File.WriteAllBytes(Path.Combine(dir, "input" + target.FileExtension), record.Input.Data);
        File.WriteAllBytes(Path.Combine(dir, "shrunk" + target.FileExtension), shrunk.Data);
        var report = new StringBuilder()
            .AppendLine($"target: {target.Name}")
            .AppendLine($"kind: {record.Failure.Kind}")
            .AppendLine($"signature: {record.Failure.Signature}")
            .AppendLine($"inputs that failed this way: {record.Count}")
            .AppendLine($"variant: {shrunk.Variant}; full fit: {shrunk.Pipeline}")
            .AppendLine($"shrunk input's CsCheck seed: {seed}")
            .AppendLine($"first input's CsCheck seed: {record.Seed}")
            .AppendLine($"replay: dotnet run --project tools/FitSpec.Fuzz -- replay {target.Name} {Path.Combine(dir, "shrunk" + target.FileExtension)} --variant {shrunk.Variant}{(shrunk.Pipeline ? " --full-fit" : "")}")
            .AppendLine()
            .AppendLine(record.Failure.Message)
            .AppendLine()
            .AppendLine(record.Failure.Detail);
        File.WriteAllText(Path.Combine(dir, "report.txt"), report.ToString());
        return dir;
    }

    private static Thread StartWatchdogThread(Action body)
    {
        var thread = new Thread(() => body()) { IsBackground = true, Name = "fuzz watchdog" };
        thread.Start();
        return thread;
    }

    private static Watchdog StartWatchdog(IFuzzTarget target, CampaignOptions options, ConcurrentDictionary<int, InFlight> running, TimeSpan limit, Action<string> log)
    {
        var stop = new CancellationTokenSource();
        StartWatchdogThread(() =>
        {
            while (!stop.Token.WaitHandle.WaitOne(500))
            {
                foreach (var (_, flight) in running)
                {
                    if (Stopwatch.GetElapsedTime(flight.Start) <= limit)
                    {
                        continue;
                    }

                    var record = new FailureRecord(-1, flight.Seed, flight.Input, new Failure(FailureKind.Slow, "hang", $"still running after {limit.TotalSeconds:0} s", ""));
                    var saved = options.FindingsFolder is { } folder ? Save(folder, target, record, flight.Input, flight.Seed) : "(not saved)";
                    log($"{target.Name}: an input is still running after {limit.TotalSeconds:0} s; saved to {saved}; stopping");
                    Environment.Exit(3);
                }
            }
        });
        return new Watchdog(stop);
    }

    // Inputs go through files (the CSV reader and full fits read paths): a memory-backed folder keeps the
    // run CPU-bound where there is one.
    private static string WorkRoot() =>
        OperatingSystem.IsLinux() && Directory.Exists("/dev/shm") ? "/dev/shm" : Path.GetTempPath();

    private static string Describe(IFuzzTarget target, FuzzCase input, string seed) =>
        $"target {target.Name}, variant {input.Variant}, full fit {input.Pipeline}, CsCheck seed {seed}\n";

    private static string? SeedOf(string message) => SeedPattern().Match(message) is { Success: true } m ? m.Groups[1].Value : null;

    private static uint StreamOf(string name)
    {
        uint hash = 2166136261;
        foreach (var c in name)
        {
            hash = (hash ^ c) * 16777619;
        }

        return hash;
    }

    // SplitMix64 of (seed, index): well-spread, independent seeds for neighbouring indices.
    private static ulong Mix(ulong seed, ulong index)
    {
        var z = seed + ((index + 1) * 0x9E3779B97F4A7C15UL);
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    private static void InterlockedMax(ref long target, long value)
    {
        var current = Interlocked.Read(ref target);
        while (value > current)
        {
            var seen = Interlocked.CompareExchange(ref target, value, current);
            if (seen == current)
            {
                return;
            }

            current = seen;
        }
    }

    [GeneratedRegex("Set seed: \"([^\"]+)\"")]
    private static partial Regex SeedPattern();

    private sealed record FailureRecord(int Index, string Seed, FuzzCase Input, Failure Failure)
    {
        public long Count { get; init; } = 1;
    }

    private sealed record InFlight(long Start, FuzzCase Input, string Seed);

    private sealed class Watchdog(CancellationTokenSource stop) : IDisposable
    {
        public void Dispose()
        {
            stop.Cancel();
            stop.Dispose();
        }
    }
}
