using System.Globalization;
using System.Text;
using FitSpec.Pipeline.Batch;
using Spectre.Console;

namespace FitSpec.Cli;

/// <summary>The table printed at the end of a batch: one row per fit, in the order of the specs.</summary>
internal static class SummaryTable
{
    private static readonly string[] Headers = ["fit", "status", "accept", "rmse", "max|e|", "run", "seconds"];

    /// <summary>Plain columns separated by at least two spaces (cells hold no double space), for logs and scripts.</summary>
    public static void WritePlain(TextWriter output, IReadOnlyList<FitRun> runs)
    {
        var rows = runs.Select(Cells).ToList();
        var widths = Headers.Select((h, j) => rows.Select(r => r[j].Length).Append(h.Length).Max()).ToArray();
        output.WriteLine(Line(Headers, widths));
        foreach (var row in rows)
        {
            output.WriteLine(Line(row, widths));
        }
    }

    public static void WriteRich(IAnsiConsole console, IReadOnlyList<FitRun> runs)
    {
        var table = new Table().Border(TableBorder.Rounded);
        foreach (var (header, j) in Headers.Select((h, j) => (h, j)))
        {
            var column = new TableColumn(header);
            table.AddColumn(j is 3 or 4 or 6 ? column.RightAligned() : column);
        }

        foreach (var run in runs)
        {
            var cells = Cells(run);
            var statusColour = run.Summary.Solved ? "green" : run.ExitCode == 2 ? "red" : "yellow";
            var acceptColour = run.Summary.AcceptanceFailed ? "red bold" : "default";
            table.AddRow(
                Markup.Escape(cells[0]),
                $"[{statusColour}]{Markup.Escape(cells[1])}[/]",
                $"[{acceptColour}]{Markup.Escape(cells[2])}[/]",
                cells[3], cells[4],
                run.Source == FitSource.Cached ? $"[grey]{cells[5]}[/]" : cells[5],
                cells[6]);
        }

        console.Write(table);
    }

    private static string[] Cells(FitRun run)
    {
        var s = run.Summary;
        var accept = s.AcceptanceTotal == 0 ? "—"
            : string.Create(CultureInfo.InvariantCulture, $"{s.AcceptancePassed}/{s.AcceptanceTotal}{(s.AcceptanceFailed ? " FAIL" : "")}");
        var source = run.Problems.Count > 0 ? "not written" : run.Source switch
        {
            FitSource.Cached => "cached",
            FitSource.Skipped => "not run",
            FitSource.Cancelled => "not finished",
            _ => "solved",
        };
        return
        [
            s.Name, s.Status, accept, Number(s.Rmse), Number(s.MaxAbsResidual), source,
            run.Elapsed.TotalSeconds.ToString("F2", CultureInfo.InvariantCulture),
        ];
    }

    private static string Number(double? x) =>
        x is { } v && double.IsFinite(v) ? (v == 0 ? "0" : v.ToString("G4", CultureInfo.InvariantCulture)) : "—";

    private static string Line(IReadOnlyList<string> cells, int[] widths)
    {
        var sb = new StringBuilder();
        for (var j = 0; j < cells.Count; j++)
        {
            var last = j == cells.Count - 1;
            var right = j is 3 or 4 or 6;
            var cell = right ? cells[j].PadLeft(widths[j]) : last ? cells[j] : cells[j].PadRight(widths[j]);
            sb.Append(cell);
            if (!last)
            {
                sb.Append("  ");
            }
        }

        return sb.ToString().TrimEnd();
    }
}
