using FitSpec.ClusterTests.Support;

namespace FitSpec.ClusterTests;

/// <summary>`solve --shard` on one machine: the shards split the batch exactly and put back together give the single run's files.</summary>
[Collection(ClusterCollection.Name)]
public sealed class ShardPartitionTests(BatchFixture batch)
{
    [Fact]
    public async Task Every_fit_belongs_to_exactly_one_shard()
    {
        // Each shard alone in its own folder, all at once (they share nothing).
        var shards = await Task.WhenAll(Enumerable.Range(0, BatchFixture.ShardCount).Select(batch.ShardAloneAsync));

        var owners = new Dictionary<string, List<int>>(StringComparer.Ordinal);
        for (var i = 0; i < shards.Length; i++)
        {
            Assert.True(shards[i].Run.ExitCode == 0, $"shard {i}: {shards[i].Run}");
            Assert.True(File.Exists(Path.Combine(shards[i].Out, ".fitspec-shards", $"shard-{i}-of-{BatchFixture.ShardCount}.json")), $"shard {i} left no record");
            Assert.False(File.Exists(Path.Combine(shards[i].Out, "index.html")), $"shard {i} wrote index.html; only merge writes the index pages");
            Assert.False(File.Exists(Path.Combine(shards[i].Out, "index.md")), $"shard {i} wrote index.md; only merge writes the index pages");
            // With 200 fits over 4 shards an empty shard means the fits are not spread by name.
            Assert.True(shards[i].Fits.Count > 0, $"shard {i} of {BatchFixture.ShardCount} got no fit of {SpecBatch.Size}");
            foreach (var fit in shards[i].Fits)
            {
                owners.TryAdd(fit, []);
                owners[fit].Add(i);
            }
        }

        var unowned = batch.Names.Where(n => !owners.ContainsKey(n)).ToList();
        var shared = owners.Where(o => o.Value.Count > 1).Select(o => $"{o.Key} (shards {string.Join(", ", o.Value)})").ToList();
        var unknown = owners.Keys.Except(batch.Names).ToList();
        Assert.True(unowned.Count == 0, "fits no shard solved: " + string.Join(", ", unowned));
        Assert.True(shared.Count == 0, "fits solved by more than one shard: " + string.Join(", ", shared));
        Assert.Empty(unknown);
    }

    [Fact]
    public async Task Shards_run_in_turn_into_one_folder_and_merged_match_the_single_run()
    {
        var reference = await batch.ReferenceAsync();
        Assert.True(reference.ExitCode == 0, "single run: " + reference);

        var work = batch.NewWorkFolder("in-turn");
        for (var i = 0; i < BatchFixture.ShardCount; i++)
        {
            var shard = await Fitspec.RunAsync(work, "solve", batch.Specs, "--out", "out", "--shard", $"{i}/{BatchFixture.ShardCount}", "--jobs", "2");
            Assert.True(shard.ExitCode == 0, $"shard {i}: {shard}");
        }

        var merge = await Fitspec.RunAsync(work, "merge", "out");
        Assert.True(merge.ExitCode == 0, "merge: " + merge);
        Assert.Matches($@"\b{SpecBatch.Size} fits\b", merge.Stdout);

        var outDir = Path.Combine(work, "out");
        OutputTree.AssertIdentical(batch.ReferenceOut, OutputTree.Read(batch.ReferenceOut), outDir, OutputTree.Read(outDir, ShardBookkeeping));
    }

    [Fact]
    public async Task Auto_shard_takes_its_index_and_count_from_a_slurm_array_task()
    {
        // Task 6 of an array numbered 4..7 is its third task: shard 2 of 4.
        var work = batch.NewWorkFolder("auto-slurm");
        var environment = new Dictionary<string, string?>
        {
            ["SLURM_ARRAY_TASK_ID"] = "6",
            ["SLURM_ARRAY_TASK_MIN"] = "4",
            ["SLURM_ARRAY_TASK_COUNT"] = "4",
            ["JOB_COMPLETION_INDEX"] = null,
        };
        var run = await Fitspec.RunAsync(work, environment, "solve", batch.Specs, "--out", "out", "--shard", "auto", "--jobs", "2");

        Assert.True(run.ExitCode == 0, run.ToString());
        Assert.True(File.Exists(Path.Combine(work, "out", ".fitspec-shards", "shard-2-of-4.json")), "no record shard-2-of-4.json: " + run);
        Assert.Equal((await batch.ShardAloneAsync(2)).Fits, BatchFixture.FitsIn(Path.Combine(work, "out")));
    }

    [Fact]
    public async Task Auto_shard_with_a_count_takes_its_index_from_an_indexed_job()
    {
        var work = batch.NewWorkFolder("auto-k8s");
        var environment = new Dictionary<string, string?>
        {
            ["JOB_COMPLETION_INDEX"] = "1",
            ["SLURM_ARRAY_TASK_ID"] = null,
            ["SLURM_ARRAY_TASK_MIN"] = null,
            ["SLURM_ARRAY_TASK_COUNT"] = null,
        };
        var run = await Fitspec.RunAsync(work, environment, "solve", batch.Specs, "--out", "out", "--shard", $"auto/{BatchFixture.ShardCount}", "--jobs", "2");

        Assert.True(run.ExitCode == 0, run.ToString());
        Assert.True(File.Exists(Path.Combine(work, "out", ".fitspec-shards", "shard-1-of-4.json")), "no record shard-1-of-4.json: " + run);
        Assert.Equal((await batch.ShardAloneAsync(1)).Fits, BatchFixture.FitsIn(Path.Combine(work, "out")));
    }

    /// <summary>What a sharded run adds to the out folder for the merge, and the single run never writes.</summary>
    internal static bool ShardBookkeeping(string relative) => relative.StartsWith(".fitspec-shards/", StringComparison.Ordinal);
}
