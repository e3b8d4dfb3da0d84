using System.CommandLine;
using FitSpec.Diagnostics;
using FitSpec.Review;

namespace FitSpec.Cli;

/// <summary>
/// `fitspec diff OLD NEW`: what changed between two result files or two folders of results.
/// Exit 0 no differences, 1 differences, 2 bad input.
/// </summary>
internal static class DiffCommand
{
    public static Command Build()
    {
        var old = new Argument<string>("old") { Description = "The earlier results: a <name>.result.json file, or a folder of them (as written by 'fitspec solve --out')" };
        var @new = new Argument<string>("new") { Description = "The later results: the same kind as OLD (a file, or a folder)" };
        var markdown = new Option<bool>("--markdown") { Description = "Write a Markdown report (for a pull-request comment) instead of plain text" };
        var tolerance = new Option<double>("--tolerance")
        {
            HelpName = "X",
            Description = "Numbers within X × max(1, |old|) of the old value count as unchanged (default 0: any change of a stored value counts)",
            DefaultValueFactory = _ => 0,
        };
        var all = new Option<bool>("--all") { Description = "Detail every fit and every compared item, unchanged ones too" };
        var command = new Command("diff", "Compare two sets of results: changed coefficients, metrics, statuses and acceptance verdicts")
        {
            old, @new, markdown, tolerance, all,
        };
        command.SetAction(parse => Run(parse.GetValue(old)!, parse.GetValue(@new)!, parse.GetValue(tolerance), parse.GetValue(markdown), parse.GetValue(all)));
        return command;
    }

    private static int Run(string oldPath, string newPath, double tolerance, bool markdown, bool all)
    {
        if (!double.IsFinite(tolerance) || tolerance < 0)
        {
            Console.Error.WriteLine($"fitspec: error: --tolerance must be a number ≥ 0 (got {tolerance.ToString(System.Globalization.CultureInfo.InvariantCulture)}); use 0 for exact comparison");
            return 2;
        }

        var oldKind = KindOf(oldPath);
        var newKind = KindOf(newPath);
        var missing = new[] { (oldPath, oldKind), (newPath, newKind) }.Where(p => p.Item2 == PathKind.Missing).ToList();
        foreach (var (path, _) in missing)
        {
            Console.Error.WriteLine($"{path}: error: no such result file or folder");
        }

        if (missing.Count > 0)
        {
            return 2;
        }

        if (oldKind != newKind)
        {
            Console.Error.WriteLine($"fitspec: error: cannot compare a {Word(oldKind)} ({oldPath}) with a {Word(newKind)} ({newPath}); give two result files or two folders of results");
            return 2;
        }

        ResultDiff diff;
        try
        {
            diff = oldKind == PathKind.Folder
                ? Compare(() => NonEmpty(ResultFolder.Read(oldPath)), () => NonEmpty(ResultFolder.Read(newPath)), (o, n) => ResultComparer.Compare(o, n, new NumberTolerance(tolerance)))
                : Compare(() => ResultFile.Read(oldPath), () => ResultFile.Read(newPath), (o, n) => ResultComparer.Compare(o, n, new NumberTolerance(tolerance)));
        }
        catch (FitSpecException e)
        {
            foreach (var d in e.Diagnostics)
            {
                Console.Error.WriteLine(d.ToString());
            }

            return 2;
        }

        Console.Out.Write(markdown ? MarkdownDiffReport.Render(diff, all) : TextDiffReport.Render(diff, all));
        return diff.HasDifferences ? 1 : 0;
    }

    // Both sides are read before either is reported, so that every bad file is listed in one run.
    private static ResultDiff Compare<T>(Func<T> readOld, Func<T> readNew, Func<T, T, ResultDiff> compare)
    {
        T? old = default;
        T? @new = default;
        var errors = new List<Diagnostic>();
        try
        {
            old = readOld();
        }
        catch (FitSpecException e)
        {
            errors.AddRange(e.Diagnostics);
        }

        try
        {
            @new = readNew();
        }
        catch (FitSpecException e)
        {
            errors.AddRange(e.Diagnostics);
        }

        return errors.Count > 0 ? throw new FitSpecException(errors) : compare(old!, @new!);
    }

    // A folder without results is most likely the wrong folder; comparing two would pass as "no differences".
    private static ResultSet NonEmpty(ResultSet set) =>
        set.Fits.Count > 0
            ? set
            : throw new FitSpecException(new Diagnostic(set.Source, null, null, null, $"no *{ResultFile.Suffix} files in this folder; give the --out folder of 'fitspec solve'"));

    private static PathKind KindOf(string path) =>
        Directory.Exists(path) ? PathKind.Folder : File.Exists(path) ? PathKind.File : PathKind.Missing;

    private static string Word(PathKind kind) => kind == PathKind.Folder ? "folder" : "file";

    private enum PathKind
    {
        Missing,
        File,
        Folder,
    }
}
