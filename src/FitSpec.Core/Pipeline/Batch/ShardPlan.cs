using FitSpec.Spec;

namespace FitSpec.Pipeline.Batch;

/// <summary>A shard's view of the batch: every spec with its fit's shard, and the specs this shard runs (in batch order).</summary>
public sealed record ShardPlan(Shard Shard, IReadOnlyList<BatchMember> Batch, IReadOnlyList<string> Own)
{
    /// <summary>Reads every spec for its fit name (as the batch itself does), so the split is the same for every worker.</summary>
    public static ShardPlan Of(Shard shard, IReadOnlyList<string> specs, bool allowOutsidePaths)
    {
        ArgumentNullException.ThrowIfNull(shard);
        ArgumentNullException.ThrowIfNull(specs);
        var names = new string[specs.Count];
        Parallel.For(0, specs.Count, i => names[i] = PathConfinement.Apply(SpecReader.Read(specs[i]), allowOutsidePaths).Name);
        var batch = specs.Select((s, i) => new BatchMember(s, names[i], Shard.Of(names[i], shard.Count))).ToList();
        return new ShardPlan(shard, batch, batch.Where(m => m.Shard == shard.Index).Select(m => m.Spec).ToList());
    }
}
