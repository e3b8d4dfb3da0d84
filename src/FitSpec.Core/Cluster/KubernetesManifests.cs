using System.Globalization;
using System.Text;
using System.Text.Json;

namespace FitSpec.Cluster;

/// <summary>
/// Manifests for Kubernetes: an Indexed Job whose completion i solves shard i of N (--shard auto/N reads
/// JOB_COMPLETION_INDEX), and a plain Job that merges, applied once the first has completed. Both mount the
/// shared volume (a PersistentVolumeClaim) and start in it, so spec and out paths are as seen from there.
/// </summary>
public static class KubernetesManifests
{
    public const string ShardsFile = "fitspec-k8s-shards.yaml";
    public const string MergeFile = "fitspec-k8s-merge.yaml";

    public static string Shards(ClusterJob job, string image, string claim, string mount)
    {
        ArgumentNullException.ThrowIfNull(job);
        var command = Tool(job).Concat(job.SolveArguments($"auto/{job.Tasks}"));
        var text = new StringBuilder();
        text.Append("# Written by 'fitspec cluster k8s': shard i of the batch per completion index. Apply with kubectl apply -f.\n");
        Job(text, job.Name + "-shards", image, claim, mount, command, job.Tasks, job.Jobs);
        return text.ToString();
    }

    public static string Merge(ClusterJob job, string image, string claim, string mount)
    {
        ArgumentNullException.ThrowIfNull(job);
        var text = new StringBuilder();
        text.Append(CultureInfo.InvariantCulture, $"# Written by 'fitspec cluster k8s': apply after 'kubectl wait --for=condition=complete job/{job.Name}-shards' (or once it has failed, to see which shards are missing).\n");
        Job(text, job.Name + "-merge", image, claim, mount, [.. Tool(job), "merge", job.OutDir], tasks: null, cpus: 1);
        return text.ToString();
    }

    private static IEnumerable<string> Tool(ClusterJob job) => job.Tool.Split(' ', StringSplitOptions.RemoveEmptyEntries);

    private static void Job(StringBuilder text, string name, string image, string claim, string mount, IEnumerable<string> command, int? tasks, int cpus)
    {
        text.Append("apiVersion: batch/v1\nkind: Job\nmetadata:\n");
        text.Append(CultureInfo.InvariantCulture, $"  name: {S(name)}\nspec:\n");
        if (tasks is { } n)
        {
            text.Append(CultureInfo.InvariantCulture, $"  completionMode: Indexed\n  completions: {n}\n  parallelism: {n}\n  backoffLimit: {n}\n");
        }
        else
        {
            text.Append("  backoffLimit: 1\n");
        }

        text.Append("  template:\n    spec:\n      restartPolicy: Never\n      containers:\n        - name: fitspec\n");
        text.Append(CultureInfo.InvariantCulture, $"          image: {S(image)}\n");
        text.Append(CultureInfo.InvariantCulture, $"          workingDir: {S(mount)}\n");
        text.Append(CultureInfo.InvariantCulture, $"          command: [{string.Join(", ", command.Select(S))}]\n");
        text.Append(CultureInfo.InvariantCulture, $"          resources:\n            requests:\n              cpu: {S(cpus.ToString(CultureInfo.InvariantCulture))}\n");
        text.Append(CultureInfo.InvariantCulture, $"          volumeMounts:\n            - name: shared\n              mountPath: {S(mount)}\n");
        text.Append(CultureInfo.InvariantCulture, $"      volumes:\n        - name: shared\n          persistentVolumeClaim:\n            claimName: {S(claim)}\n");
    }

    // A JSON string is a valid YAML flow scalar, so every value is quoted the same safe way.
    private static string S(string value) => JsonSerializer.Serialize(value);
}
