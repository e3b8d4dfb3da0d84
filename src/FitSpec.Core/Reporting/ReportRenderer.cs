using System.Collections.Concurrent;
using System.Globalization;
using FitSpec.Reporting.Plots;
using FitSpec.Results;
using FitSpec.Spec;
using Scriban;
using Scriban.Runtime;
using Scriban.Syntax;

namespace FitSpec.Reporting;

/// <summary>
/// Renders a <see cref="FitResult"/> to Markdown or self-contained HTML through Scriban templates
/// (report.md.sbn / report.html.sbn). It reads only the result and never re-solves.
/// </summary>
public static class ReportRenderer
{
    /// <summary>The caution every report carries, whatever the outcome.</summary>
    public const string Caution =
        "A fit is evidence, not a validated calibration. Before relying on it, review it under your quality system, " +
        "the regulations that apply to you and licensed professional practice.";

    private const string TemplatesFolderName = "templates";

    // Parsed templates are immutable and safe to render from many threads (each render has its own context).
    // The cache is keyed by full path and remembers the source, so an edited file is re-parsed.
    private static readonly ConcurrentDictionary<string, CachedTemplate> Cache = new(StringComparer.Ordinal);

    private static readonly Lazy<string?> DefaultFolder = new(FindDefaultFolder, LazyThreadSafetyMode.ExecutionAndPublication);

    /// <summary>
    /// Renders one result. <paramref name="templateFolder"/> overrides the default templates; a format whose
    /// file is missing from it falls back to the default template.
    /// </summary>
    /// <exception cref="ReportTemplateException">The template is missing, does not parse, or fails while rendering.</exception>
    public static string Render(FitResult result, ReportFormat format, string? templateFolder = null)
    {
        ArgumentNullException.ThrowIfNull(result);
        return Render(result, format, templateFolder, ReportPlots.Build(result));
    }

    /// <summary>
    /// Renders one result with plots already drawn (so a caller writing several formats draws them once). HTML
    /// inlines each plot; Markdown links &lt;name&gt;.&lt;key&gt;.svg, which the caller writes beside the .md.
    /// </summary>
    /// <exception cref="ReportTemplateException">The template is missing, does not parse, or fails while rendering.</exception>
    public static string Render(FitResult result, ReportFormat format, string? templateFolder, IReadOnlyList<ReportPlot> plots)
    {
        ArgumentNullException.ThrowIfNull(result);
        ArgumentNullException.ThrowIfNull(plots);
        var fileName = format switch
        {
            ReportFormat.Md => "report.md.sbn",
            ReportFormat.Html => "report.html.sbn",
            _ => throw new ArgumentOutOfRangeException(nameof(format), format, "only Markdown and HTML reports are rendered from templates"),
        };

        var path = ResolveTemplate(fileName, templateFolder);
        var template = Load(path);
        var context = CreateContext(result, format, plots);
        try
        {
            return template.Render(context);
        }
        catch (ScriptRuntimeException e)
        {
            throw new ReportTemplateException($"report template {path} failed while rendering: {e.Message}", e);
        }
    }

    /// <summary>The folder holding the built-in templates, or null when none can be found.</summary>
    public static string? DefaultTemplateFolder => DefaultFolder.Value;

    private static string ResolveTemplate(string fileName, string? templateFolder)
    {
        if (templateFolder is not null)
        {
            if (!Directory.Exists(templateFolder))
            {
                throw new ReportTemplateException($"report template folder {templateFolder} does not exist");
            }

            var overridden = Path.GetFullPath(Path.Combine(templateFolder, fileName));
            if (File.Exists(overridden))
            {
                return overridden;
            }
        }

        var folder = DefaultFolder.Value
            ?? throw new ReportTemplateException(
                $"no default report templates found: expected {TemplatesFolderName}/{fileName} under {AppContext.BaseDirectory} or a parent folder");
        var path = Path.Combine(folder, fileName);
        return File.Exists(path) ? path : throw new ReportTemplateException($"report template {path} is missing");
    }

    private static string? FindDefaultFolder()
    {
        var beside = Path.Combine(AppContext.BaseDirectory, TemplatesFolderName);
        if (File.Exists(Path.Combine(beside, "report.md.sbn")))
        {
            return Path.GetFullPath(beside);
        }

        // Tests and tools run from bin/ folders inside the repository; walk up to its templates/.
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory).Parent; dir is not null; dir = dir.Parent)
        {
            var candidate = Path.Combine(dir.FullName, TemplatesFolderName);
            if (File.Exists(Path.Combine(candidate, "report.md.sbn")))
            {
                return candidate;
            }
        }

        return null;
    }

    private static Template Load(string path)
    {
        string source;
        try
        {
            // Line endings are normalised so a template checked out with CRLF renders the same bytes.
            source = File.ReadAllText(path).Replace("\r\n", "\n", StringComparison.Ordinal);
        }
        catch (IOException e)
        {
            throw new ReportTemplateException($"report template {path} could not be read: {e.Message}", e);
        }
        catch (UnauthorizedAccessException e)
        {
            throw new ReportTemplateException($"report template {path} could not be read: {e.Message}", e);
        }

        if (Cache.TryGetValue(path, out var cached) && string.Equals(cached.Source, source, StringComparison.Ordinal))
        {
            return cached.Template;
        }

        var template = Template.Parse(source, path);
        if (template.HasErrors)
        {
            var messages = string.Join(Environment.NewLine, template.Messages.Select(m => m.ToString()));
            throw new ReportTemplateException($"report template {path} has errors:{Environment.NewLine}{messages}");
        }

        Cache[path] = new CachedTemplate(source, template);
        return template;
    }

    private static TemplateContext CreateContext(FitResult result, ReportFormat format, IReadOnlyList<ReportPlot> plots)
    {
        var globals = new ScriptObject();
        globals.SetValue("result", result, true);
        globals.SetValue("report", ReportFacts.Build(result, format, plots), true);
        Import(globals, "fmt", ReportFunctions.Number);
        Import(globals, "full", ReportFunctions.FullNumber);
        Import(globals, "brief", ReportFunctions.BriefNumber);
        Import(globals, "percent", ReportFunctions.Percent);
        Import(globals, "prose_h", ReportFunctions.HtmlProse);
        Import(globals, "prose_md", ReportFunctions.MarkdownProse);
        Import(globals, "link", ReportFunctions.LinkTarget);
        Import(globals, "yes_no", ReportFunctions.YesNo);
        Import(globals, "pass_fail", ReportFunctions.PassFail);
        Import(globals, "text", ReportFunctions.Text);
        Import(globals, "h", ReportFunctions.Html);
        Import(globals, "md", ReportFunctions.Markdown);
        Import(globals, "md_block", ReportFunctions.MarkdownBlock);
        Import(globals, "md_code", ReportFunctions.MarkdownCode);
        Import(globals, "md_code_cell", ReportFunctions.MarkdownCodeCell);
        Import(globals, "location", ReportFunctions.Location);

        var context = new TemplateContext
        {
            // C# members appear snake_case (result.max_abs_residual); only properties are visible.
            MemberRenamer = StandardMemberRenamer.Rename,
            MemberFilter = member => member is System.Reflection.PropertyInfo,
            StrictVariables = true,
            NewLine = "\n",
            // Large fits make long tables; never truncate a report silently.
            LoopLimit = 0,
            LimitToString = 0,
            OutputLimit = 0,
        };
        context.PushCulture(CultureInfo.InvariantCulture);
        context.PushGlobal(globals);
        return context;
    }

    private static void Import(ScriptObject globals, string name, Func<object?, string> function) =>
        globals.Import(name, function);

    private sealed record CachedTemplate(string Source, Template Template);
}
