using System.CommandLine;
using System.CommandLine.Parsing;
using FitSpec.Diagnostics;
using FitSpec.Lowering;
using FitSpec.Pipeline;
using FitSpec.Solving;
using FitSpec.Spec;

namespace FitSpec.Cli;

/// <summary>The fitspec command line: solve, check, lower.</summary>
internal static class Commands
{
    public static RootCommand Build()
    {
        var root = new RootCommand("fitspec: compile declarative fit specs to LP/QP/MILP, solve, verify and report.");
        root.Subcommands.Add(SolveCommand.Build());
        root.Subcommands.Add(Check());
        root.Subcommands.Add(Lower());
        root.Subcommands.Add(DiffCommand.Build());
        root.Subcommands.Add(SchemaCommand.Build());
        root.Subcommands.Add(MergeCommand.Build());
        root.Subcommands.Add(ClusterCommand.Build());
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

    private static Command Check()
    {
        var specs = new Argument<string[]>("specs") { Arity = ArgumentArity.OneOrMore, Description = "Spec files (*.fit.yaml), folders, or quoted patterns such as 'specs/**/*.fit.yaml'" };
        var outside = SolveCommand.OutsidePathsOption();
        var command = new Command("check", "Validate specs, read their data and lower them; print the problem class and size without solving") { specs, outside };
        command.SetAction(parse =>
        {
            var files = SpecDiscovery.Find(parse.GetValue(specs)!, out var missing);
            var exit = missing.Count > 0 ? 2 : 0;
            foreach (var m in missing)
            {
                Console.Error.WriteLine(SolveCommand.MissingMessage(m));
            }

            foreach (var file in files)
            {
                exit = Math.Max(exit, CheckOne(file, parse.GetValue(outside)));
            }

            return exit;
        });
        return command;
    }

    private static Command Lower()
    {
        var spec = new Argument<string>("spec") { Description = "One spec file" };
        var mps = new Option<string>("--mps") { Description = "Write the lowered program to this file in free MPS (HiGHS's writer)", Required = true };
        var outside = SolveCommand.OutsidePathsOption();
        var command = new Command("lower", "Lower one spec and export the exact program it solves as MPS") { spec, mps, outside };
        command.SetAction(parse =>
        {
            var path = parse.GetValue(spec)!;
            if (!TryLower(path, forceProgram: true, parse.GetValue(outside), out var lowered))
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
            var temp = Path.Combine(dir, $".{Path.GetFileName(target)}.{Environment.ProcessId}.tmp.mps");
            try
            {
                Directory.CreateDirectory(dir);
                ProgramExport.Write(lowered!.Program, temp);
                File.Move(temp, target, overwrite: true);
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                // A file standing where a folder must be, a read-only place, a full disk: one line, not a trace.
                Console.Error.WriteLine($"{target}: error: cannot write the MPS file: {e.Message}; choose a --mps path in a writable folder");
                return 2;
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

    private static int CheckOne(string file, bool allowOutside)
    {
        if (!TryLower(file, forceProgram: false, allowOutside, out var lowered))
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

    private static bool TryLower(string file, bool forceProgram, bool allowOutside, out LoweredFit? lowered)
    {
        lowered = null;
        var read = PathConfinement.Apply(SpecReader.Read(file), allowOutside);
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
}
