using System.Globalization;
using FitSpec.Reporting;
using FitSpec.Results;
using Scriban;
using Scriban.Runtime;
using Scriban.Syntax;

namespace FitSpec.Pipeline.Batch;

/// <summary>One fit's row on the index pages; links are relative to the out folder and already URL-encoded.</summary>
public sealed record IndexRow(
    string Name,
    string? Title,
    string SpecFile,
    string Status,
    string StatusClass,
    string? Detail,
    int AcceptancePassed,
    int AcceptanceTotal,
    bool AcceptanceFailed,
    int? Observations,
    double? Rmse,
    double? MaxAbsResidual,
    double? R2,
    double? Objective,
    string? Html,
    string? Md,
    string? Json);

/// <summary>
/// Everything the index templates see (as `index`). The counts follow the exit codes: passed (0), failed
/// acceptance (1), no optimum reached (3), errors (2).
/// </summary>
public sealed record IndexModel(
    IReadOnlyList<IndexRow> Fits,
    int Total,
    int Passed,
    int AcceptanceFailed,
    int NotOptimal,
    int Errors,
    string Caution,
    string ToolVersion,
    string CommandLine,
    string? Stamp);

/// <summary>
/// The run's index pages, OUT/index.html and OUT/index.md: every fit of the run with its status, acceptance,
/// key metrics and links to its files, rendered from templates/index.html.sbn and index.md.sbn (found where
/// the report templates are). A page is only replaced when its text changes, so a run in which nothing
/// changed leaves the folder exactly as it was.
/// </summary>
public static class IndexPages
{
    public const string HtmlTemplate = "index.html.sbn";
    public const string MdTemplate = "index.md.sbn";

    /// <summary>Renders and writes both pages; returns the paths of the pages that changed.</summary>
    /// <exception cref="ReportTemplateException">A template is missing or broken.</exception>
    public static IReadOnlyList<string> Write(string outDir, IReadOnlyList<FitRun> runs, RunSettings settings)
    {
        ArgumentNullException.ThrowIfNull(outDir);
        var model = Model(runs, settings);
        var pages = new[]
        {
            (Path.Combine(outDir, BatchRunner.IndexName + ".html"), Render(HtmlTemplate, model)),
            (Path.Combine(outDir, BatchRunner.IndexName + ".md"), Render(MdTemplate, model)),
        };

        Directory.CreateDirectory(outDir);
        var changed = new List<string>();
        foreach (var (path, text) in pages)
        {
            if (!Unchanged(path, text))
            {
                AtomicFile.Write(path, text);
                changed.Add(path);
            }
        }

        return changed;
    }

    public static IndexModel Model(IReadOnlyList<FitRun> runs, RunSettings settings)
    {
        ArgumentNullException.ThrowIfNull(runs);
        ArgumentNullException.ThrowIfNull(settings);
        var rows = runs.Select(Row).ToList();
        var version = FitRunner.ToolVersion.Split('+')[0];
        return new IndexModel(
            rows,
            runs.Count,
            runs.Count(r => r.ExitCode == 0),
            runs.Count(r => r.ExitCode == 1),
            runs.Count(r => r.ExitCode == 3),
            runs.Count(r => r.ExitCode == 2),
            ReportRenderer.Caution,
            version,
            settings.CommandLine,
            settings.Stamp ? DateTime.UtcNow.ToString("yyyy-MM-ddTHH:mm:ssZ", CultureInfo.InvariantCulture) : null);
    }

    /// <summary>Renders one index template with <paramref name="model"/>.</summary>
    public static string Render(string templateName, IndexModel model)
    {
        var folder = ReportRenderer.DefaultTemplateFolder
            ?? throw new ReportTemplateException($"no templates folder found beside {AppContext.BaseDirectory} or above it; expected {templateName} there");
        var path = Path.Combine(folder, templateName);
        string source;
        try
        {
            source = File.ReadAllText(path).Replace("\r\n", "\n", StringComparison.Ordinal);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new ReportTemplateException($"index template {path} could not be read: {e.Message}", e);
        }

        var template = Template.Parse(source, path);
        if (template.HasErrors)
        {
            throw new ReportTemplateException($"index template {path} has errors: {string.Join("; ", template.Messages.Select(m => m.ToString()))}");
        }

        try
        {
            return template.Render(Context(model));
        }
        catch (ScriptRuntimeException e)
        {
            throw new ReportTemplateException($"index template {path} failed while rendering: {e.Message}", e);
        }
    }

    private static IndexRow Row(FitRun run)
    {
        var s = run.Summary;
        var detail = run.Problems.Count > 0 ? "its files could not be written: " + run.Problems[0]
            : s.Errors.Count > 0 ? s.Errors[0] + (s.Errors.Count > 1 ? $" (and {s.Errors.Count - 1} more)" : "")
            : s.Solved ? null
            : s.StatusDetail;
        return new IndexRow(
            s.Name, s.Title, s.SpecFile, s.Status, StatusClass(s.Status), detail,
            s.AcceptancePassed, s.AcceptanceTotal, s.AcceptanceFailed,
            s.Observations, s.Rmse, s.MaxAbsResidual, s.R2, s.Objective,
            Link(run, s.Name + ".html"), Link(run, s.Name + ".md"), Link(run, s.Name + ".result.json"));
    }

    // Only files this run's record says exist are linked, so no link points at a stale or missing file.
    private static string? Link(FitRun run, string file) =>
        run.Outputs.FirstOrDefault(o => string.Equals(o, file, StringComparison.Ordinal)) is { } found
            ? string.Join('/', found.Split('/').Select(Uri.EscapeDataString))
            : null;

    // A fixed set of class names, as in the reports, so status text never reaches an attribute unchecked.
    private static string StatusClass(string status) => status switch
    {
        "optimal" => "ok",
        "local-optimum" => "local",
        "time-limit" => "warn",
        "infeasible" or "unbounded" or "error" => "bad",
        _ => "other",
    };

    private static bool Unchanged(string path, string text)
    {
        try
        {
            return File.Exists(path) && string.Equals(File.ReadAllText(path), text, StringComparison.Ordinal);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return false;
        }
    }

    private static TemplateContext Context(IndexModel model)
    {
        var globals = new ScriptObject();
        globals.SetValue("index", model, true);
        globals.Import("fmt", new Func<object?, string>(ReportFunctions.Number));
        globals.Import("text", new Func<object?, string>(ReportFunctions.Text));
        globals.Import("h", new Func<object?, string>(ReportFunctions.Html));
        globals.Import("md", new Func<object?, string>(ReportFunctions.Markdown));
        globals.Import("md_code", new Func<object?, string>(ReportFunctions.MarkdownCode));
        globals.Import("md_code_cell", new Func<object?, string>(ReportFunctions.MarkdownCodeCell));
        var context = new TemplateContext
        {
            MemberRenamer = StandardMemberRenamer.Rename,
            MemberFilter = member => member is System.Reflection.PropertyInfo,
            StrictVariables = true,
            NewLine = "\n",
            LoopLimit = 0,
            LimitToString = 0,
            OutputLimit = 0,
        };
        context.PushCulture(CultureInfo.InvariantCulture);
        context.PushGlobal(globals);
        return context;
    }
}
