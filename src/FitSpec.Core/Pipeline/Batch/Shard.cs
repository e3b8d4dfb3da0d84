using System.Buffers.Binary;
using System.Globalization;
using System.Security.Cryptography;
using System.Text;

namespace FitSpec.Pipeline.Batch;

/// <summary>
/// One worker's part of a batch: shard Index (0-based) of Count. A fit belongs to the shard its name hashes
/// to (SHA-256 of the name, first 8 bytes, modulo Count), so every worker computes its own set from the spec
/// files alone, with no coordination, and a fit keeps its shard however the batch grows.
/// </summary>
public sealed record Shard(int Index, int Count)
{
    public bool Owns(string fitName) => Of(fitName, Count) == Index;

    public static int Of(string fitName, int count)
    {
        ArgumentNullException.ThrowIfNull(fitName);
        var digest = SHA256.HashData(Encoding.UTF8.GetBytes(fitName));
        return (int)(BinaryPrimitives.ReadUInt64BigEndian(digest) % (ulong)count);
    }

    public override string ToString() => $"{Index}/{Count}";

    /// <summary>
    /// "I/N"; "auto" (index and count from a Slurm array task's environment); "auto/N" (the index from Slurm's or a
    /// Kubernetes Indexed Job's environment, the count given). Null with an error message when it cannot be read.
    /// </summary>
    public static Shard? Parse(string text, Func<string, string?> environment, out string? error)
    {
        ArgumentNullException.ThrowIfNull(text);
        ArgumentNullException.ThrowIfNull(environment);
        error = null;
        var parts = text.Split('/');
        if (parts.Length > 2 || parts[0].Length == 0)
        {
            error = $"--shard '{text}' is not I/N, auto or auto/N";
            return null;
        }

        int? count = null;
        if (parts.Length == 2)
        {
            if (!int.TryParse(parts[1], NumberStyles.None, CultureInfo.InvariantCulture, out var n) || n < 1)
            {
                error = $"--shard '{text}': the count after '/' must be a whole number ≥ 1";
                return null;
            }

            count = n;
        }

        int index;
        if (parts[0] == "auto")
        {
            if (!FromEnvironment(environment, ref count, out index, out error))
            {
                return null;
            }
        }
        else if (!int.TryParse(parts[0], NumberStyles.None, CultureInfo.InvariantCulture, out index) || count is null)
        {
            error = $"--shard '{text}' is not I/N (e.g. 0/4), auto or auto/N";
            return null;
        }

        if (index >= count)
        {
            error = $"--shard {index}/{count}: the index must be below the count (shards are numbered 0 to {count - 1})";
            return null;
        }

        return new Shard(index, count!.Value);
    }

    private static bool FromEnvironment(Func<string, string?> environment, ref int? count, out int index, out string? error)
    {
        index = 0;
        error = null;
        if (Number(environment("SLURM_ARRAY_TASK_ID")) is { } task)
        {
            index = task - (Number(environment("SLURM_ARRAY_TASK_MIN")) ?? 0);
            count ??= Number(environment("SLURM_ARRAY_TASK_COUNT"));
        }
        else if (Number(environment("JOB_COMPLETION_INDEX")) is { } completion)
        {
            index = completion;
        }
        else
        {
            error = "--shard auto: no SLURM_ARRAY_TASK_ID or JOB_COMPLETION_INDEX in the environment; run it as a Slurm array task or a Kubernetes Indexed Job, or give --shard I/N";
            return false;
        }

        if (count is null or < 1)
        {
            error = "--shard auto: the shard count is not in the environment (SLURM_ARRAY_TASK_COUNT); give it as --shard auto/N";
            return false;
        }

        if (index < 0)
        {
            error = $"--shard auto: the task index from the environment is negative ({index})";
            return false;
        }

        return true;
    }

    private static int? Number(string? text) =>
        int.TryParse(text, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out var v) ? v : null;
}
