using FitSpec.Spec;

namespace FitSpec.Pipeline.Batch;

/// <summary>
/// One batch: the spec files (in order), the out folder, the formats asked for on the command line (empty:
/// each spec's own report.formats), how many fits run at once, whether the cache is ignored, and the
/// settings every fit is run with.
/// </summary>
public sealed record BatchRequest(
    IReadOnlyList<string> Specs,
    string OutDir,
    IReadOnlyList<ReportFormat> Formats,
    int Jobs,
    bool Force,
    RunSettings Settings);
