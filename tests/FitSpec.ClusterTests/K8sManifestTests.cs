using FitSpec.ClusterTests.Support;
using YamlDotNet.RepresentationModel;
using static FitSpec.ClusterTests.Support.Manifest;

namespace FitSpec.ClusterTests;

/// <summary>`fitspec cluster k8s` writes an Indexed Job (one completion per shard) and a merge Job over one shared volume.</summary>
[Collection(ClusterCollection.Name)]
public sealed class K8sManifestTests(BatchFixture batch)
{
    private const string Image = "registry.example.org/lab/fitspec:0.1";

    [Fact]
    public async Task Shards_job_is_indexed_with_one_completion_per_shard_on_the_claim()
    {
        var (outDir, run) = await GenerateAsync("--tasks", "3", "--image", Image, "--claim", "bench-results", "--mount", "/data");
        Assert.True(run.ExitCode == 0, run.ToString());

        var job = Load(Path.Combine(outDir, "fitspec-k8s-shards.yaml")).SingleJob();
        Assert.Equal("batch/v1", Scalar(job, "apiVersion"));
        Assert.Equal("Indexed", Scalar(job, "spec.completionMode"));
        Assert.Equal("3", Scalar(job, "spec.completions"));
        Assert.Equal("3", Scalar(job, "spec.parallelism"));
        Assert.Equal("Never", Scalar(job, "spec.template.spec.restartPolicy"));
        Assert.False(string.IsNullOrEmpty(Scalar(job, "metadata.name")), "the Job has no metadata.name");

        var container = SingleContainer(job);
        Assert.Equal(Image, Scalar(container, "image"));
        var words = CommandLine(container);
        var line = string.Join(' ', words);
        Assert.Contains("solve", words);
        Assert.Contains("specs", words);
        Assert.Contains("--out out", line, StringComparison.Ordinal);
        Assert.Contains("--shard auto/3", line, StringComparison.Ordinal);
        AssertSharedVolume(job, container, "bench-results", "/data");
    }

    [Fact]
    public async Task Merge_job_runs_merge_on_the_same_volume()
    {
        var (outDir, run) = await GenerateAsync("--tasks", "5", "--image", Image, "--claim", "bench-results", "--mount", "/data");
        Assert.True(run.ExitCode == 0, run.ToString());

        var shards = Load(Path.Combine(outDir, "fitspec-k8s-shards.yaml")).SingleJob();
        var merge = Load(Path.Combine(outDir, "fitspec-k8s-merge.yaml")).SingleJob();
        Assert.Equal("batch/v1", Scalar(merge, "apiVersion"));
        Assert.Equal("Never", Scalar(merge, "spec.template.spec.restartPolicy"));
        // Both are applied into one namespace, so they must not share a name.
        Assert.NotEqual(Scalar(shards, "metadata.name"), Scalar(merge, "metadata.name"));
        Assert.Null(Scalar(merge, "spec.completionMode"));

        var container = SingleContainer(merge);
        Assert.Equal(Image, Scalar(container, "image"));
        var words = CommandLine(container);
        Assert.Contains("merge", words);
        Assert.Contains("out", words);
        Assert.DoesNotContain("solve", words);
        AssertSharedVolume(merge, container, "bench-results", "/data");
    }

    [Fact]
    public async Task Volume_is_mounted_at_shared_unless_told_otherwise()
    {
        var (outDir, run) = await GenerateAsync("--tasks", "2", "--image", Image, "--claim", "bench-results");
        Assert.True(run.ExitCode == 0, run.ToString());

        foreach (var file in new[] { "fitspec-k8s-shards.yaml", "fitspec-k8s-merge.yaml" })
        {
            var job = Load(Path.Combine(outDir, file)).SingleJob();
            AssertSharedVolume(job, SingleContainer(job), "bench-results", "/shared");
        }
    }

    /// <summary>Writes the manifests for the relative specs folder into a fresh work folder's out/.</summary>
    private async Task<(string OutDir, ProcessRun Run)> GenerateAsync(params string[] options)
    {
        var work = batch.NewWorkFolder("k8s");
        var run = await Fitspec.RunAsync(work, ["cluster", "k8s", "specs", "--out", "out", .. options]);
        return (Path.Combine(work, "out"), run);
    }

    // The container mounts a volume at the path, and that volume is the claim.
    private static void AssertSharedVolume(YamlNode job, YamlNode container, string claim, string mountPath)
    {
        var mount = Assert.Single(Sequence(container, "volumeMounts"), m => Scalar(m, "mountPath") == mountPath);
        var volumeName = Scalar(mount, "name");
        var volume = Assert.Single(Sequence(job, "spec.template.spec.volumes"), v => Scalar(v, "name") == volumeName);
        Assert.Equal(claim, Scalar(volume, "persistentVolumeClaim.claimName"));
    }
}
