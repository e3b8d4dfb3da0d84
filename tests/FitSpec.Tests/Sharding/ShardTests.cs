using FitSpec.Pipeline.Batch;

namespace FitSpec.Tests.Sharding;

/// <summary>Shard arguments and the split of fits by name: every worker must compute the same split alone.</summary>
public sealed class ShardTests
{
    private static Func<string, string?> Env(params (string Key, string Value)[] vars) =>
        key => vars.FirstOrDefault(v => v.Key == key).Value;

    [Theory]
    [InlineData("0/4", 0, 4)]
    [InlineData("3/4", 3, 4)]
    [InlineData("0/1", 0, 1)]
    public void Explicit_shards_are_read(string text, int index, int count)
    {
        Assert.Equal(new Shard(index, count), Shard.Parse(text, Env(), out _));
    }

    [Theory]
    [InlineData("4/4", "must be below the count")]
    [InlineData("1/0", "whole number ≥ 1")]
    [InlineData("-1/4", "is not I/N")]
    [InlineData("2", "is not I/N")]
    [InlineData("a/b/c", "is not I/N")]
    [InlineData("auto", "no SLURM_ARRAY_TASK_ID or JOB_COMPLETION_INDEX")]
    public void Bad_shards_say_what_is_wrong(string text, string message)
    {
        Assert.Null(Shard.Parse(text, Env(), out var error));
        Assert.Contains(message, error, StringComparison.Ordinal);
    }

    [Fact]
    public void Auto_takes_the_index_and_count_from_a_slurm_array_task_and_the_index_from_an_indexed_job()
    {
        Assert.Equal(new Shard(2, 4), Shard.Parse("auto", Env(("SLURM_ARRAY_TASK_ID", "2"), ("SLURM_ARRAY_TASK_COUNT", "4")), out _));
        // An array numbered from 1 (--array=1-4): shards still start at 0.
        Assert.Equal(new Shard(0, 4), Shard.Parse("auto", Env(("SLURM_ARRAY_TASK_ID", "1"), ("SLURM_ARRAY_TASK_MIN", "1"), ("SLURM_ARRAY_TASK_COUNT", "4")), out _));
        Assert.Equal(new Shard(3, 5), Shard.Parse("auto/5", Env(("JOB_COMPLETION_INDEX", "3")), out _));
        Assert.Null(Shard.Parse("auto", Env(("JOB_COMPLETION_INDEX", "3")), out var error));
        Assert.Contains("give it as --shard auto/N", error, StringComparison.Ordinal);
    }

    [Fact]
    public void Every_fit_belongs_to_exactly_one_shard_and_the_split_is_stable_and_spread()
    {
        var names = Enumerable.Range(0, 2000).Select(i => $"sensor-{i:D4}").ToList();
        const int count = 8;
        var sizes = new int[count];
        foreach (var name in names)
        {
            var owners = Enumerable.Range(0, count).Where(i => new Shard(i, count).Owns(name)).ToList();
            Assert.Single(owners);
            Assert.Equal(owners[0], Shard.Of(name, count));
            sizes[owners[0]]++;
        }

        // 2000 names over 8 shards: 250 each on average; a hash split stays well within ±25 % (binomial sd ≈ 15).
        Assert.All(sizes, s => Assert.InRange(s, 190, 310));
    }
}
