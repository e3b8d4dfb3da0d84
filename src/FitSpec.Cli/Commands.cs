using System.CommandLine;
using System.CommandLine.Parsing;
using FitSpec.Diagnostics;
using FitSpec.Lowering;
using FitSpec.Pipeline;
using FitSpec.Results;
using FitSpec.Solving;
using FitSpec.Spec;

namespace FitSpec.Cli;

/// <summary>The fitspec command line: solve, check, lower.</summary>
internal static class Commands
{
    public static RootCommand Build()
    {
        var root = new RootCommand("fitspec: compile declarative fit specs to LP/QP/MILP, solve, verify and report.");
        root.Subcommands.Add(Solve());
        root.Subcommands.Add(Check());
        root.Subcommands.Add(Lower());
        return root;
    }

    public static int UsageError(ParseResult parsed)
    {
        foreach (var e in parsed.Errors)
        {
            Console.Error.WriteLine($"fitspec: error: {e.Message}");
        }

        Console.Error.WriteLine("fitspec: run 'fitspec --help' or 'fitspec <command> --help' for usage");
        return 2;
    }

    private static Command Solve()
    {
        var specs = new Argument<string[]>("specs") { Arity = ArgumentArity.OneOrMore, Description = "Spec files (*.fit.yaml) or folders to search for them" };
        var outDir = new Option<string>("--out") { Description = "Folder for results and reports (created if missing)", Required = true };
        var formats = new Option<string?>("--format") { Description = "Comma-separated formats to write: html,md,json (default: each spec's report.formats)" };
        var jobs = new Option<int>("--jobs") { Description = "Fits to run in parallel (default: number of cores)", DefaultValueFactory = _ => Environment.ProcessorCount };
        var command = new Command("solve", "Solve fit specs and write verified results and reports") { specs, outDir, formats, jobs };
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
                Console.Error.WriteLine($"{m}: error: no such spec file or folder");
            }

            if (files.Count == 0)
            {
                Console.Error.WriteLine("fitspec: error: no spec files (*.fit.yaml) found");
                return 2;
            }

            var results = new FitResult?[files.Count];
            var outFolder = parse.GetValue(outDir)!;
            var duplicates = DuplicateNames(files);
            var writeFailed = false;
            var parallel = new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, parse.GetValue(jobs)) };
            Parallel.For(0, files.Count, parallel, i =>
            {
                if (duplicates.TryGetValue(i, out var first))
                {
                    // Its files would overwrite the other fit's: report, write nothing.
                    results[i] = DuplicateResult(files[i], files[first]);
                    return;
                }

                var outcome = FitRunner.RunForOutput(files[i]);
                var result = outcome.Result;
                results[i] = result;
                try
                {
                    OutputWriter.Write(result, outFolder, formatList.Count > 0 ? formatList : outcome.Formats, outcome.TemplateFolder);
                }
                catch (Exception e) when (e is IOException or UnauthorizedAccessException)
                {
                    lock (results)
                    {
                        Console.Error.WriteLine($"{outFolder}: error: cannot write the results of '{result.Name}': {e.Message}");
                        writeFailed = true;
                    }
                }
                catch (Reporting.ReportTemplateException e)
                {
                    lock (results)
                    {
                        Console.Error.WriteLine($"{files[i]}: error: report template: {e.Message.ReplaceLineEndings(" ")}");
                        writeFailed = true;
                    }
                }
            });

            var exit = missing.Count > 0 ? 2 : 0;
            foreach (var r in results)
            {
                Report(r!);
                exit = Math.Max(exit, r!.ExitCode);
            }

            return writeFailed ? Math.Max(exit, 2) : exit;
        });
        return command;
    }

    private static Command Check()
    {
        var specs = new Argument<string[]>("specs") { Arity = ArgumentArity.OneOrMore, Description = "Spec files (*.fit.yaml) or folders" };
        var command = new Command("check", "Validate specs, read their data and lower them; print the problem class and size without solving") { specs };
        command.SetAction(parse =>
        {
            var files = SpecDiscovery.Find(parse.GetValue(specs)!, out var missing);
            var exit = missing.Count > 0 ? 2 : 0;
            foreach (var m in missing)
            {
                Console.Error.WriteLine($"{m}: error: no such spec file or folder");
            }

            foreach (var file in files)
            {
                exit = Math.Max(exit, CheckOne(file));
            }

            return exit;
        });
        return command;
    }

    private static Command Lower()
    {
        var spec = new Argument<string>("spec") { Description = "One spec file" };
        var mps = new Option<string>("--mps") { Description = "Write the lowered program to this file in free MPS (HiGHS's writer)", Required = true };
        var command = new Command("lower", "Lower one spec and export the exact program it solves as MPS") { spec, mps };
        command.SetAction(parse =>
        {
            var path = parse.GetValue(spec)!;
            if (!TryLower(path, forceProgram: true, out var lowered))
            {
                return 2;
            }

            if (lowered!.Class is ProblemClass.QPSequence or ProblemClass.Local)
            {
                Console.Error.WriteLine($"{path}: error: loss '{lowered.Spec.Loss.KindName}' is solved by {(lowered.Class == ProblemClass.QPSequence ? "a sequence of QPs" : "a local method over several programs")}, so no single program describes the fit; MPS export covers LP, QP and MILP fits");
                return 2;
            }

            var target = parse.GetValue(mps)!;
            var dir = Path.GetDirectoryName(Path.GetFullPath(target))!;
            Directory.CreateDirectory(dir);
            var temp = Path.Combine(dir, $".{Path.GetFileName(target)}.{Environment.ProcessId}.tmp.mps");
            try
            {
                ProgramExport.Write(lowered!.Program, temp);
                File.Move(temp, target, overwrite: true);
            }
            finally
            {
                if (File.Exists(temp))
                {
                    File.Delete(temp);
                }
            }

            Console.WriteLine($"{lowered!.Spec.Name}: wrote {target} ({Describe(lowered.Program)})");
            return 0;
        });
        return command;
    }

    // Fit names must be unique in one out folder: the later of two specs with the same name is refused.
    private static Dictionary<int, int> DuplicateNames(IReadOnlyList<string> files)
    {
        var firstByName = new Dictionary<string, int>(StringComparer.Ordinal);
        var duplicates = new Dictionary<int, int>();
        for (var i = 0; i < files.Count; i++)
        {
            var name = SpecReader.Read(files[i]).Name;
            if (!firstByName.TryAdd(name, i))
            {
                duplicates[i] = firstByName[name];
            }
        }

        return duplicates;
    }

    private static FitResult DuplicateResult(string file, string other)
    {
        var read = SpecReader.Read(file);
        var message = $"fit name '{read.Name}' is also the name of {other}; names must be unique in one run (set 'name:')";
        return new FitResult(
            read.Name, "error", message, file, null, null, null, null, null, [], null, null, [], [], null, [], [],
            new Provenance("", null, FitRunner.ToolVersion, "", "", ""), [new ErrorEntry(file, null, null, "name", message)]);
    }

    private static int CheckOne(string file)
    {
        if (!TryLower(file, forceProgram: false, out var lowered))
        {
            return 2;
        }

        var fit = lowered!;
        var size = fit.Class == ProblemClass.ClosedForm
            ? $"closed-form, {fit.Design.Rows} rows × {fit.Design.P} coefficients"
            : $"{FitRunner.ClassName(fit.Class)}, {Size(fit.Program)}";
        Console.WriteLine($"{fit.Spec.Name}: ok: {size}");
        return 0;
    }

    private static bool TryLower(string file, bool forceProgram, out LoweredFit? lowered)
    {
        lowered = null;
        var read = SpecReader.Read(file);
        if (read.Document is null)
        {
            PrintErrors(read.Errors);
            return false;
        }

        try
        {
            lowered = FitRunner.Lower(read.Document, forceProgram);
            return true;
        }
        catch (FitSpecException e)
        {
            PrintErrors(e.Diagnostics);
            return false;
        }
    }

    private static string Describe(FitProgram p) => $"{p.Class}, {Size(p)}";

    private static string Size(FitProgram p) =>
        $"{p.NumVars} variables, {p.NumRows} rows, {p.NonZeros} non-zeros" + (p.HasQuadratic ? $", {p.QValue.Length} Hessian entries" : "");

    private static void PrintErrors(IEnumerable<Diagnostic> errors)
    {
        foreach (var d in errors)
        {
            Console.Error.WriteLine(d.ToString());
        }
    }

    private static void Report(FitResult r)
    {
        if (r.Errors.Count > 0)
        {
            foreach (var e in r.Errors)
            {
                Console.Error.WriteLine(new Diagnostic(e.File, e.Line, e.Column, e.Field, e.Message).ToString());
            }

            return;
        }

        var objective = r.Objective is { } o ? $" objective {o:G10}" : "";
        var failed = r.Acceptance.Count(a => !a.Passed);
        var acceptance = r.Acceptance.Count == 0 ? "" : failed == 0 ? $", {r.Acceptance.Count} acceptance rules passed" : $", {failed} of {r.Acceptance.Count} acceptance rules FAILED";
        var line = $"{r.Name}: {r.Status}{objective}{acceptance}";
        if (r.Status is "optimal" or "local-optimum")
        {
            Console.WriteLine(line);
        }
        else
        {
            Console.Error.WriteLine($"{line}: {r.StatusDetail}");
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

        return list;
    }
}
