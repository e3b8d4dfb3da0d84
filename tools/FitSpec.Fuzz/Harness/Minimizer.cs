using System.Diagnostics;
using FitSpec.Fuzz.Mutation;

namespace FitSpec.Fuzz.Harness;

/// <summary>
/// Shrinks a failing input's bytes after CsCheck has shrunk its generator choices: removes ever smaller
/// chunks while the input still fails the same way, so a saved finding is as short as the budget allows.
/// </summary>
public static class Minimizer
{
    public static byte[] Minimize(byte[] input, Func<byte[], bool> stillFails, TimeSpan budget, int maxProbes)
    {
        ArgumentNullException.ThrowIfNull(input);
        ArgumentNullException.ThrowIfNull(stillFails);
        var clock = Stopwatch.StartNew();
        var probes = 0;
        var current = input;
        var chunk = Math.Max(1, current.Length / 2);
        while (clock.Elapsed < budget && probes < maxProbes)
        {
            var changed = false;
            for (var start = 0; start < current.Length && clock.Elapsed < budget && probes < maxProbes;)
            {
                var candidate = Bytes.Splice(current, start, chunk, []);
                probes++;
                if (candidate.Length < current.Length && stillFails(candidate))
                {
                    current = candidate;
                    changed = true;
                }
                else
                {
                    start += chunk;
                }
            }

            if (!changed)
            {
                if (chunk == 1)
                {
                    break;
                }

                chunk = Math.Max(1, chunk / 2);
            }
        }

        return current;
    }
}
