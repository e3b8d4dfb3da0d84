using System.CommandLine;
using FitSpec.Pipeline.Batch;
using FitSpec.Reporting;

namespace FitSpec.Cli;

/// <summary>
/// `fitspec merge OUT`: after the shards of a batch have run into one out folder, writes the run's index pages
/// and the summary from their records. Missing shards are named by number and leave the pages unwritten.
/// </summary>
internal static class MergeCommand
{
    public static Command Build()
    {
        var outDir = new Argument<string>("out") { Description = "The out folder the shards wrote into (fitspec solve ... --shard I/N --out OUT)" };
        var command = new Command("merge", "Put a sharded batch back together: check every shard reported, write the index pages and the summary") { outDir };
        command.SetAction(parse => Run(parse.GetValue(outDir)!));
        return command;
    }

    private static int Run(string outDir)
    {
        var merged = ShardMerge.Read(outDir, out var error);
        if (merged is null)
        {
            Console.Error.WriteLine(error);
            return 2;
        }

        var exit = 0;
        foreach (var run in merged.Runs)
        {
            exit = Math.Max(exit, run.ExitCode);
            foreach (var line in FitLines.Problems(run))
            {
                Console.Error.WriteLine(line);
            }
        }

        if (merged.MissingShards.Count > 0 || merged.Missing.Count > 0)
        {
            foreach (var shard in merged.MissingShards)
            {
                var fits = merged.Missing.Where(m => m.Shard == shard).Select(m => m.Name).ToList();
                Console.Error.WriteLine($"{outDir}: error: shard {shard} of {merged.Count} has not reported (no {ShardRecord.FolderName}/{ShardRecord.FileName(shard, merged.Count)}): not run, still running, or stopped before it finished; {fits.Count} fit{(fits.Count == 1 ? "" : "s")} missing{(fits.Count > 0 ? ": " + string.Join(", ", fits.Take(10)) + (fits.Count > 10 ? ", …" : "") : "")}");
            }

            foreach (var fit in merged.Missing.Where(m => !merged.MissingShards.Contains(m.Shard)))
            {
                Console.Error.WriteLine($"{outDir}: error: fit '{fit.Name}' ({fit.Spec}) of shard {fit.Shard} is not in that shard's record; run shard {fit.Shard}/{merged.Count} again");
            }

            Console.Out.WriteLine($"merge: {merged.Runs.Count} of {merged.Runs.Count + merged.Missing.Count} fits reported; index pages not written; exit 2");
            return 2;
        }

        try
        {
            IndexPages.Write(outDir, merged.Runs, merged.Settings);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            Console.Error.WriteLine($"{outDir}: error: cannot write the index pages: {e.Message}");
            exit = Math.Max(exit, 2);
        }
        catch (ReportTemplateException e)
        {
            Console.Error.WriteLine($"fitspec: error: {e.Message.ReplaceLineEndings(" ")}");
            exit = Math.Max(exit, 2);
        }

        SummaryTable.WritePlain(Console.Out, merged.Runs);
        Console.Out.WriteLine($"merged {merged.Count} shard{(merged.Count == 1 ? "" : "s")}; " + FitLines.Total(merged.Runs, exit));
        return exit;
    }
}
