using System.Collections.Concurrent;

namespace FitSpec.Fuzz.Harness;

/// <summary>Labelled counts a target keeps beside the harness's own (e.g. the statuses of full fits).</summary>
public sealed class Tally
{
    private readonly ConcurrentDictionary<string, long> _counts = new(StringComparer.Ordinal);

    public void Add(string label) => _counts.AddOrUpdate(label, 1, (_, n) => n + 1);

    public IReadOnlyDictionary<string, long> Snapshot() =>
        _counts.OrderBy(kv => kv.Key, StringComparer.Ordinal).ToDictionary(kv => kv.Key, kv => kv.Value, StringComparer.Ordinal);
}
