using System.CommandLine;
using System.Diagnostics;
using FitSpec.Cluster;
using FitSpec.Pipeline.Batch;
using FitSpec.Results;

namespace FitSpec.Cli;

/// <summary>
/// `fitspec cluster slurm|k8s SPECS --tasks N --out SHARED`: writes what a cluster scheduler needs to run a
/// batch as N shards plus a merge (and for Slurm, with --submit, submits it). No scheduler of our own: the
/// shards find their part from the scheduler's task index.
/// </summary>
internal static class ClusterCommand
{
    public static Command Build()
    {
        var command = new Command("cluster", "Write (and for Slurm submit) the jobs that run a batch as shards across machines, then merge it");
        command.Subcommands.Add(Slurm());
        command.Subcommands.Add(Kubernetes());
        return command;
    }

    private sealed record CommonOptions(Argument<string[]> Specs, Option<string> Out, Option<int> Tasks, Option<string> Tool, Option<int> Jobs, Option<string> Name);

    private static CommonOptions Common(Command command)
    {
        var common = new CommonOptions(
            new Argument<string[]>("specs") { Arity = ArgumentArity.OneOrMore, Description = "Spec files, folders or quoted patterns, as the workers will see them" },
            new Option<string>("--out") { Description = "The shared out folder (on storage every worker mounts)", Required = true },
            new Option<int>("--tasks") { Description = "Number of shards (array tasks / completions)", Required = true },
            new Option<string>("--tool") { Description = "Command that runs FitSpec on a worker (default: fitspec, found on PATH)", DefaultValueFactory = _ => "fitspec" },
            new Option<int>("--jobs") { Description = "Fits each shard runs in parallel (CPUs asked per task)", DefaultValueFactory = _ => 1 },
            new Option<string>("--name") { Description = "Name prefix of the jobs", DefaultValueFactory = _ => "fitspec" });
        AtLeastOne(common.Tasks);
        AtLeastOne(common.Jobs);
        command.Arguments.Add(common.Specs);
        foreach (var option in new Option[] { common.Out, common.Tasks, common.Tool, common.Jobs, common.Name })
        {
            command.Options.Add(option);
        }

        return common;
    }

    /// <summary>A count option that must be 1 or more (the error names the option).</summary>
    public static void AtLeastOne(Option<int> option)
    {
        option.Validators.Add(r =>
        {
            if (r.GetValueOrDefault<int>() < 1)
            {
                r.AddError($"{option.Name} must be at least 1");
            }
        });
    }

    private static ClusterJob Job(ParseResult parse, CommonOptions o) => new(
        parse.GetValue(o.Specs)!, parse.GetValue(o.Out)!, parse.GetValue(o.Tasks), parse.GetValue(o.Tool)!, parse.GetValue(o.Jobs), parse.GetValue(o.Name)!);

    private static Command Slurm()
    {
        var command = new Command("slurm", "Write an sbatch array script (task i solves shard i) and a merge script; --submit submits both, the merge after every task");
        var o = Common(command);
        var submit = new Option<bool>("--submit") { Description = "Submit with sbatch: the array, then the merge with --dependency=afterany on it" };
        var partition = new Option<string?>("--partition") { Description = "Slurm partition for both jobs" };
        var time = new Option<string?>("--time") { Description = "Slurm time limit per task (e.g. 30 or 2:00:00)" };
        command.Options.Add(submit);
        command.Options.Add(partition);
        command.Options.Add(time);
        command.SetAction(parse =>
        {
            var job = Job(parse, o);
            var outDir = Path.GetFullPath(job.OutDir);
            var logs = Path.Combine(outDir, ShardRecord.FolderName);
            if (new[] { outDir, Environment.CurrentDirectory }.FirstOrDefault(p => p.Any(char.IsWhiteSpace)) is { } spaced)
            {
                // #SBATCH lines end a value at the first blank, so such a path cannot be given to Slurm there.
                Console.Error.WriteLine($"{spaced}: error: Slurm job scripts cannot hold a folder path with spaces (#SBATCH --chdir/--output); use an out folder and a working folder without spaces");
                return 2;
            }

            var shardsPath = Path.Combine(outDir, SlurmScripts.ShardsFile);
            var mergePath = Path.Combine(outDir, SlurmScripts.MergeFile);
            if (!TryWrite([
                (shardsPath, SlurmScripts.Shards(job, Environment.CurrentDirectory, logs, parse.GetValue(partition), parse.GetValue(time))),
                (mergePath, SlurmScripts.Merge(job, Environment.CurrentDirectory, logs, parse.GetValue(partition), parse.GetValue(time)))], logs))
            {
                return 2;
            }

            Console.Out.WriteLine($"wrote {shardsPath} ({job.Tasks} array tasks) and {mergePath}");
            if (!parse.GetValue(submit))
            {
                Console.Out.WriteLine($"submit with: sbatch --parsable {shardsPath}, then sbatch --dependency=afterany:<array job id> {mergePath}");
                return 0;
            }

            var array = Sbatch(shardsPath);
            if (array is null)
            {
                return 2;
            }

            var merge = Sbatch(mergePath, $"--dependency=afterany:{array}");
            if (merge is null)
            {
                return 2;
            }

            Console.Out.WriteLine($"submitted array job {array} ({job.Tasks} tasks) and merge job {merge}");
            return 0;
        });
        return command;
    }

    private static Command Kubernetes()
    {
        var command = new Command("k8s", "Write an Indexed Job manifest (completion i solves shard i) and a merge Job manifest for Kubernetes");
        var o = Common(command);
        var image = new Option<string>("--image") { Description = "Container image with fitspec on its PATH", Required = true };
        var claim = new Option<string>("--claim") { Description = "PersistentVolumeClaim of the shared storage", DefaultValueFactory = _ => "fitspec-shared" };
        var mount = new Option<string>("--mount") { Description = "Where the shared storage is mounted in the container (the jobs start there)", DefaultValueFactory = _ => "/shared" };
        image.Validators.Add(r =>
        {
            if (string.IsNullOrWhiteSpace(r.GetValueOrDefault<string>()))
            {
                r.AddError("--image must name a container image");
            }
        });
        command.Options.Add(image);
        command.Options.Add(claim);
        command.Options.Add(mount);
        command.SetAction(parse =>
        {
            var job = Job(parse, o);
            var here = Path.GetFullPath(job.OutDir);
            var shardsPath = Path.Combine(here, KubernetesManifests.ShardsFile);
            var mergePath = Path.Combine(here, KubernetesManifests.MergeFile);
            string img = parse.GetValue(image)!, pvc = parse.GetValue(claim)!, at = parse.GetValue(mount)!;
            if (!TryWrite([(shardsPath, KubernetesManifests.Shards(job, img, pvc, at)), (mergePath, KubernetesManifests.Merge(job, img, pvc, at))], here))
            {
                return 2;
            }

            Console.Out.WriteLine($"wrote {shardsPath} ({job.Tasks} indexed completions) and {mergePath}");
            Console.Out.WriteLine($"run with: kubectl apply -f {shardsPath}; kubectl wait --for=condition=complete --timeout=2h job/{job.Name}-shards; kubectl apply -f {mergePath}  (if a shard fails for good the wait times out: apply the merge anyway, it names the missing shards)");
            return 0;
        });
        return command;
    }

    private static bool TryWrite(IReadOnlyList<(string Path, string Text)> files, string folder)
    {
        try
        {
            Directory.CreateDirectory(folder);
            foreach (var (path, text) in files)
            {
                AtomicFile.Write(path, text);
            }

            return true;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            Console.Error.WriteLine($"{folder}: error: cannot write the job files: {e.Message}");
            return false;
        }
    }

    // sbatch --parsable prints "ID" or "ID;cluster".
    private static string? Sbatch(string script, params string[] options)
    {
        var info = new ProcessStartInfo("sbatch") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        info.ArgumentList.Add("--parsable");
        foreach (var option in options)
        {
            info.ArgumentList.Add(option);
        }

        info.ArgumentList.Add(script);
        try
        {
            using var process = Process.Start(info)!;
            var stderr = process.StandardError.ReadToEndAsync();
            var stdout = process.StandardOutput.ReadToEnd();
            process.WaitForExit();
            var id = stdout.Trim().Split(';')[0];
            if (process.ExitCode != 0 || id.Length == 0)
            {
                Console.Error.WriteLine($"{script}: error: sbatch failed (exit {process.ExitCode}): {stderr.Result.Trim().ReplaceLineEndings(" ")}");
                return null;
            }

            return id;
        }
        catch (System.ComponentModel.Win32Exception)
        {
            Console.Error.WriteLine("fitspec: error: sbatch not found on PATH; run on a Slurm submit host, or submit the written scripts yourself");
            return null;
        }
    }
}
