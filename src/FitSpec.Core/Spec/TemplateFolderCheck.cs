using FitSpec.Diagnostics;

namespace FitSpec.Spec;

/// <summary>
/// A `report.templates` folder that does not exist makes the spec invalid before anything is fitted, so the fit
/// ends as an error located at the value (and its result replaces an earlier run's) rather than at rendering time.
/// </summary>
public static class TemplateFolderCheck
{
    /// <summary>
    /// The error for a missing folder, if any; then <paramref name="rendered"/>, the spec the outputs are written
    /// for, loses the folder, so that the error result itself is rendered with the built-in templates.
    /// </summary>
    public static IReadOnlyList<Diagnostic> Check(FitSpecDocument spec, ref FitSpecDocument? rendered)
    {
        ArgumentNullException.ThrowIfNull(spec);
        if (spec.Report.Templates is not { } templates)
        {
            return [];
        }

        var full = Path.GetFullPath(Path.Combine(spec.Folder, templates.Value));
        if (Directory.Exists(full))
        {
            return [];
        }

        rendered = spec with { Report = spec.Report with { Templates = null } };
        var what = File.Exists(full) ? "is a file, not a folder" : "does not exist";
        return [new Diagnostic(templates.Pos.File, templates.Pos.Line, templates.Pos.Column, "report.templates",
            $"template folder '{templates.Value}' {what} (looked for {full}); create it, fix the path, or remove 'templates:' to use the built-in templates")];
    }
}
