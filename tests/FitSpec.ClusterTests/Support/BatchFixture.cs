using System.Diagnostics;

namespace FitSpec.ClusterTests.Support;

/// <summary>
/// The invented batch written once into a temp folder, and its reference: one `fitspec solve SPECS --out out
/// --jobs 2` run in its own working folder, made on first use.
/// </summary>
public sealed class BatchFixture : IAsyncLifetime
{
    private readonly TempFolder _root = new("cluster");
    private readonly SemaphoreSlim _solving = new(1, 1);
    private readonly Dictionary<int, Task<ShardRun>> _shards = [];
    private ProcessRun? _reference;

    public BatchFixture()
    {
        Specs = _root.Sub("specs");
        Names = SpecBatch.Write(Specs);
    }

    /// <summary>The absolute spec folder every run is given.</summary>
    public string Specs { get; }

    public IReadOnlyList<string> Names { get; }

    /// <summary>The out folder the reference run wrote (relative name 'out' in its working folder).</summary>
    public string ReferenceOut => Path.Combine(_root.Path, "reference", "out");

    public TimeSpan ReferenceTime { get; private set; }

    /// <summary>A new empty working folder for one run.</summary>
    public string NewWorkFolder(string label) => _root.Sub(label + "-" + Guid.NewGuid().ToString("N")[..8]);

    /// <summary>Solves the batch in one process (once) and returns the run.</summary>
    public async Task<ProcessRun> ReferenceAsync()
    {
        await _solving.WaitAsync();
        try
        {
            if (_reference is null)
            {
                var work = _root.Sub("reference");
                var clock = Stopwatch.StartNew();
                _reference = await Fitspec.RunAsync(work, "solve", Specs, "--out", "out", "--jobs", "2");
                ReferenceTime = clock.Elapsed;
            }

            return _reference;
        }
        finally
        {
            _solving.Release();
        }
    }

    /// <summary>
    /// Shard index of <see cref="ShardCount"/> solved alone (once) with `--shard I/N --out out` in its own
    /// working folder; the fits it wrote are the shard's fits.
    /// </summary>
    public Task<ShardRun> ShardAloneAsync(int index)
    {
        lock (_shards)
        {
            if (!_shards.TryGetValue(index, out var run))
            {
                run = SolveShardAsync(index);
                _shards[index] = run;
            }

            return run;
        }
    }

    public const int ShardCount = 4;

    /// <summary>The fit names whose result JSON an out folder holds.</summary>
    public static SortedSet<string> FitsIn(string outDir) =>
        new(Directory.EnumerateFiles(outDir, "*.result.json").Select(f => Path.GetFileName(f)[..^".result.json".Length]), StringComparer.Ordinal);

    private async Task<ShardRun> SolveShardAsync(int index)
    {
        var work = NewWorkFolder($"shard{index}");
        var run = await Fitspec.RunAsync(work, "solve", Specs, "--out", "out", "--shard", $"{index}/{ShardCount}", "--jobs", "2");
        return new ShardRun(run, Path.Combine(work, "out"));
    }

    public Task InitializeAsync() => Task.CompletedTask;

    public Task DisposeAsync()
    {
        _solving.Dispose();
        _root.Dispose();
        return Task.CompletedTask;
    }
}

/// <summary>One shard solved alone: the CLI run and the out folder it wrote.</summary>
public sealed record ShardRun(ProcessRun Run, string Out)
{
    public SortedSet<string> Fits => BatchFixture.FitsIn(Out);
}
