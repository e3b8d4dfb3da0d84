namespace FitSpec.Solving;

/// <summary>
/// The SplitMix64 finaliser: a fixed, well-mixed map of 64-bit words. Where FitSpec needs repeatable
/// pseudo-random choices (bootstrap draws, screening samples) it hashes indices with it, so the choice
/// depends only on the seed and the index, never on threads or run order.
/// </summary>
internal static class SplitMix
{
    public static ulong Mix(ulong z)
    {
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }
}
