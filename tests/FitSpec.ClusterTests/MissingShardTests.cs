using FitSpec.ClusterTests.Support;

namespace FitSpec.ClusterTests;

/// <summary>A merge of a batch one shard never reported for fails with exit 2 and names that shard.</summary>
[Collection(ClusterCollection.Name)]
public sealed class MissingShardTests(BatchFixture batch)
{
    [Fact]
    public async Task Merge_without_shard_2_of_4_exits_2_and_names_it()
    {
        var work = batch.NewWorkFolder("missing");
        // The three shards at once into the one folder, as workers on shared storage would.
        int[] ran = [0, 1, 3];
        var shards = await Task.WhenAll(ran.Select(i => Fitspec.RunAsync(work, "solve", batch.Specs, "--out", "out", "--shard", $"{i}/4", "--jobs", "1")));
        for (var k = 0; k < ran.Length; k++)
        {
            Assert.True(shards[k].ExitCode == 0, $"shard {ran[k]}: {shards[k]}");
        }

        var merge = await Fitspec.RunAsync(work, "merge", "out");

        Assert.True(merge.ExitCode == 2, "merge: " + merge);
        var said = merge.Stdout + merge.Stderr;
        Assert.Matches(@"shard 2 of 4\b", said);
        foreach (var reported in ran)
        {
            Assert.DoesNotMatch($@"shard {reported} of 4 has not", said);
        }

        // Its fits are the ones named as missing: a fit of shard 2 must appear in the message.
        var ownFits = BatchFixture.FitsIn(Path.Combine(work, "out"));
        var missingFit = batch.Names.Where(n => !ownFits.Contains(n)).Order(StringComparer.Ordinal).First();
        Assert.Contains(missingFit, said, StringComparison.Ordinal);
    }
}
