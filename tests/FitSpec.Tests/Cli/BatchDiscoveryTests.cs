using FitSpec.Pipeline;
using static FitSpec.Tests.Cli.BatchSpecs;

namespace FitSpec.Tests.Cli;

/// <summary>Which spec files a batch runs: folders searched recursively, patterns expanded by fitspec, each file once, in path order.</summary>
public sealed class BatchDiscoveryTests : IDisposable
{
    private readonly string root = Path.Combine(Path.GetTempPath(), "fitspec-discovery-" + Guid.NewGuid().ToString("N"));

    public BatchDiscoveryTests()
    {
        foreach (var file in (string[])["lc1.fit.yaml", "lc2.fit.yaml", "lc2.csv", "lc-notes.txt", "lcgroup/inner/c1.fit.yaml", "other/o1.fit.yaml", "other/o22.fit.yaml", ".old/lc9.fit.yaml"])
        {
            var path = Path.Combine(root, "specs", file);
            Directory.CreateDirectory(Path.GetDirectoryName(path)!);
            File.WriteAllText(path, "");
        }
    }

    public void Dispose() => Directory.Delete(root, recursive: true);

    [Fact]
    public void A_folder_is_searched_recursively_in_ordinal_path_order()
    {
        var found = Find(out var missing, "specs");
        Assert.Empty(missing);
        Assert.Equal(["specs/.old/lc9.fit.yaml", "specs/lc1.fit.yaml", "specs/lc2.fit.yaml", "specs/lcgroup/inner/c1.fit.yaml", "specs/other/o1.fit.yaml", "specs/other/o22.fit.yaml"], found);
    }

    [Fact]
    public void Double_star_matches_any_depth_and_skips_hidden_folders()
    {
        Assert.Equal(["specs/lc1.fit.yaml", "specs/lc2.fit.yaml", "specs/lcgroup/inner/c1.fit.yaml", "specs/other/o1.fit.yaml", "specs/other/o22.fit.yaml"], Find(out _, "specs/**/*.fit.yaml"));
        Assert.Equal(["specs/lcgroup/inner/c1.fit.yaml"], Find(out _, "**/inner/*.fit.yaml"));
        Assert.Equal(["specs/.old/lc9.fit.yaml"], Find(out _, "specs/.old/*.fit.yaml"));
    }

    [Fact]
    public void A_pattern_takes_matching_specs_and_searches_matching_folders_but_ignores_other_files()
    {
        Assert.Equal(["specs/lc1.fit.yaml", "specs/lc2.fit.yaml", "specs/lcgroup/inner/c1.fit.yaml"], Find(out _, "specs/lc*"));
        Assert.Equal(["specs/other/o1.fit.yaml"], Find(out _, "specs/*/o?.fit.yaml"));
    }

    [Fact]
    public void A_file_reached_twice_is_run_once_and_a_pattern_matching_nothing_is_reported()
    {
        var found = Find(out var missing, "specs/lc1.fit.yaml", "specs/lc*", "specs/nothing*", "specs/absent.fit.yaml");
        Assert.Equal(["specs/lc1.fit.yaml", "specs/lc2.fit.yaml", "specs/lcgroup/inner/c1.fit.yaml"], found);
        Assert.Equal([Rooted("specs/nothing*"), Rooted("specs/absent.fit.yaml")], missing);
    }

    /// <summary>End to end with relative, quoted patterns: the CLI expands them itself, against its working directory.</summary>
    [Fact]
    public void The_cli_expands_quoted_patterns_and_says_when_one_matches_nothing()
    {
        using var cli = new CliHarness();
        WriteBatch(cli, 3, "specs/a");
        cli.Write("specs/b/deep/fit00.fit.yaml", SpecYaml(0).Replace(Name(0), "deep00", StringComparison.Ordinal));
        cli.Write("specs/b/deep/fit01.fit.yaml", SpecYaml(1).Replace(Name(1), "deep01", StringComparison.Ordinal));
        cli.Write("specs/b/deep/deep00.csv", DataCsv(0));
        cli.Write("specs/b/deep/deep01.csv", DataCsv(1));

        var recursive = cli.Run("solve", "specs/**/*.fit.yaml", "--out", "o1");
        Assert.True(recursive.ExitCode == 0, recursive.ToString());
        Assert.Equal(["deep00", "deep01", "fit00", "fit01", "fit02"], ProgressLines(recursive).Keys.Order(StringComparer.Ordinal));
        Assert.Equal("fitspec solve 'specs/**/*.fit.yaml' --out o1", cli.Json("o1/fit00.result.json").GetProperty("provenance").GetProperty("command_line").GetString());

        var some = cli.Run("solve", "specs/a/nothing*", "specs/a/fit0?.fit.yaml", "--out", "o2");
        Assert.True(some.ExitCode == 2, some.ToString());
        Assert.Contains("specs/a/nothing*: error: no spec file (*.fit.yaml) or folder matches this pattern", some.Stderr, StringComparison.Ordinal);
        Assert.Equal(["fit00", "fit01", "fit02"], ProgressLines(some).Keys.Order(StringComparer.Ordinal));
    }

    private string Rooted(string relative) => Path.Combine(root, relative);

    // Absolute patterns (tests must not change the process's working directory); results shown relative to root.
    private List<string> Find(out IReadOnlyList<string> missing, params string[] args)
    {
        var found = SpecDiscovery.Find(args.Select(Rooted), out missing);
        return found.Select(f => Path.GetRelativePath(root, f).Replace('\\', '/')).ToList();
    }
}
