using System.CommandLine;
using FitSpec.Pipeline;
using FitSpec.Pipeline.Batch;
using FitSpec.Reporting;
using FitSpec.Spec;
using Spectre.Console;

namespace FitSpec.Cli;

/// <summary>
/// `fitspec solve`: a batch of fits into one out folder, in parallel, with a cache, a progress display,
/// a summary table and the run's index pages.
/// </summary>
internal static class SolveCommand
{
    public static Command Build()
    {
        var specs = new Argument<string[]>("specs") { Arity = ArgumentArity.OneOrMore, Description = "Spec files (*.fit.yaml), folders to search for them, or quoted patterns such as 'specs/**/*.fit.yaml'" };
        var outDir = new Option<string>("--out") { Description = "Folder for results and reports (created if missing)", Required = true };
        var formats = new Option<string?>("--format") { Description = "Comma-separated formats to write: html,md,json (default: each spec's report.formats)" };
        var jobs = new Option<int>("--jobs") { Description = "Fits to run in parallel (default: number of cores)", DefaultValueFactory = _ => Environment.ProcessorCount };
        var force = new Option<bool>("--force") { Description = "Solve every fit again, even those the cache holds as unchanged" };
        var stamp = new Option<bool>("--stamp") { Description = "Record wall-clock facts (time of the run, solve seconds) in the outputs; files then differ run to run" };
        var outside = OutsidePathsOption();
        var shard = new Option<string?>("--shard") { Description = "Solve only shard I of N of the batch (I/N, 0-based; 'auto' or 'auto/N' takes it from a Slurm array task or a Kubernetes Indexed Job); 'fitspec merge OUT' then writes the index pages" };
        ClusterCommand.AtLeastOne(jobs);

        var command = new Command("solve", "Solve fit specs and write verified results, reports and the run's index pages") { specs, outDir, formats, jobs, force, stamp, outside, shard };
        command.SetAction(parse =>
        {
            var formatList = ParseFormats(parse.GetValue(formats));
            if (formatList is null)
            {
                return 2;
            }

            var files = SpecDiscovery.Find(parse.GetValue(specs)!, out var missing);
            foreach (var m in missing)
            {
                Console.Error.WriteLine(MissingMessage(m));
            }

            if (files.Count == 0)
            {
                Console.Error.WriteLine("fitspec: error: no spec files (*.fit.yaml) found");
                return 2;
            }

            var settings = new RunSettings(RecordedCommandLine.Of(parse.Tokens.Select(t => t.Value).ToList()), parse.GetValue(stamp), parse.GetValue(outside));
            ShardPlan? plan = null;
            if (parse.GetValue(shard) is { } shardText)
            {
                var part = Shard.Parse(shardText, Environment.GetEnvironmentVariable, out var error);
                if (part is null)
                {
                    Console.Error.WriteLine($"fitspec: error: {error}");
                    return 2;
                }

                plan = ShardPlan.Of(part, files, settings.AllowOutsidePaths);
                files = plan.Own;
            }

            var request = new BatchRequest(files, parse.GetValue(outDir)!, formatList, parse.GetValue(jobs), parse.GetValue(force), settings);
            return Run(request, missing.Count > 0 ? 2 : 0, plan);
        });
        return command;
    }

    /// <summary>The option that lets specs name files outside their own folder tree (for specs the user trusts).</summary>
    public static Option<bool> OutsidePathsOption() => new(PathConfinement.Option)
    {
        Description = "Let specs read data and templates outside their own folder tree (refused by default, so a spec cannot reach files it was not given)",
    };

    /// <summary>The error line for an argument that names nothing (or a pattern that matches no spec).</summary>
    public static string MissingMessage(string argument) => PathGlob.IsPattern(argument)
        ? $"{argument}: error: no spec file (*.fit.yaml) or folder matches this pattern"
        : $"{argument}: error: no such spec file or folder";

    private static int Run(BatchRequest request, int exit, ShardPlan? plan)
    {
        var interactive = !Console.IsOutputRedirected && AnsiConsole.Profile.Capabilities.Interactive;
        IBatchProgress progress = !interactive ? new PlainProgress(Console.Out, Console.Error)
            : request.Specs.Count == 1 ? new StatusLineProgress(AnsiConsole.Console)
            : new BarProgress(AnsiConsole.Console);
        using var cancel = new CancellationTokenSource();
        using var interruption = new Interruption(cancel, request.OutDir, progress.Cancelling, () => Leave(interactive));
        IReadOnlyList<FitRun> runs;
        try
        {
            runs = progress.Show(request.Specs.Count, (finished, solving) => BatchRunner.Run(request, finished, cancel.Token, solving));
        }
        catch (OutFolderException e)
        {
            Console.Error.WriteLine(e.Message);
            return 2;
        }

        foreach (var run in runs)
        {
            exit = Math.Max(exit, run.ExitCode);
            foreach (var line in FitLines.Problems(run))
            {
                Console.Error.WriteLine(line);
            }
        }

        if (runs.Any(r => r.Source == FitSource.Cancelled))
        {
            // The index pages describe a whole run; a cancelled one leaves the last ones as they were.
            return Summarise(runs, Interruption.ExitCode, interactive);
        }

        try
        {
            // A shard's fits are one part of the batch: it leaves its record, and the merge writes the pages.
            if (plan is not null)
            {
                ShardRecord.Of(plan.Shard, request.Settings, plan.Batch, runs).Write(request.OutDir);
            }
            else
            {
                IndexPages.Write(request.OutDir, runs, request.Settings);
            }
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            Console.Error.WriteLine($"{request.OutDir}: error: cannot write the {(plan is null ? "index pages" : "shard record")}: {e.Message}");
            exit = Math.Max(exit, 2);
        }
        catch (ReportTemplateException e)
        {
            Console.Error.WriteLine($"fitspec: error: {e.Message.ReplaceLineEndings(" ")}");
            exit = Math.Max(exit, 2);
        }

        return Summarise(runs, interruption.Cancelled ? Interruption.ExitCode : exit, interactive);
    }

    private static int Summarise(IReadOnlyList<FitRun> runs, int exit, bool interactive)
    {
        if (interactive)
        {
            SummaryTable.WriteRich(AnsiConsole.Console, runs);
        }
        else
        {
            SummaryTable.WritePlain(Console.Out, runs);
        }

        Console.Out.WriteLine(FitLines.Total(runs, exit));
        return exit;
    }

    // A second Ctrl-C ends the process from inside a live display: show the cursor it hid.
    private static void Leave(bool interactive)
    {
        if (interactive)
        {
            AnsiConsole.Cursor.Show();
        }
    }

    private static List<ReportFormat>? ParseFormats(string? text)
    {
        var list = new List<ReportFormat>();
        if (string.IsNullOrWhiteSpace(text))
        {
            return list;
        }

        foreach (var part in text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            switch (part)
            {
                case "html":
                    list.Add(ReportFormat.Html);
                    break;
                case "md" or "markdown":
                    list.Add(ReportFormat.Md);
                    break;
                case "json":
                    list.Add(ReportFormat.Json);
                    break;
                default:
                    Console.Error.WriteLine($"fitspec: error: unknown format '{part}' in --format; use html, md, json");
                    return null;
            }
        }

        return list.Distinct().ToList();
    }
}
