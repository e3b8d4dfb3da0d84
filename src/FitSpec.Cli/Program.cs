using System.CommandLine;
using FitSpec.Cli;

return Commands.Build().Parse(args) is var parsed && parsed.Errors.Count > 0
    ? Commands.UsageError(parsed)
    : parsed.Invoke();
