namespace FitSpec.Pipeline;

/// <summary>
/// How one run was invoked, as far as it shows in the results. CommandLine is recorded in the provenance
/// (scheduling options such as --jobs and --force are left out by the caller, so they never change a file).
/// Stamp adds wall-clock facts (the time of the run, solve seconds), which make files differ run to run.
/// AllowOutsidePaths lets specs name files outside their own folder tree (refused by default).
/// </summary>
public sealed record RunSettings(string CommandLine, bool Stamp, bool AllowOutsidePaths = false)
{
    public static RunSettings Default { get; } = new("", false);
}
