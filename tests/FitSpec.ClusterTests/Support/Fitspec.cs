namespace FitSpec.ClusterTests.Support;

/// <summary>
/// The built CLI run as a user would: `dotnet fitspec.dll ...` (the dll is copied beside this assembly because
/// the project references the CLI project).
/// </summary>
public static class Fitspec
{
    public static string Dll { get; } = Path.Combine(AppContext.BaseDirectory, "fitspec.dll");

    /// <summary>The dotnet host running the tests, so the CLI runs on the same runtime.</summary>
    public static string DotnetHost { get; } = FindHost();

    /// <summary>The command line a batch job uses to start the CLI.</summary>
    public static string ToolCommand => $"{DotnetHost} {Dll}";

    public static Task<ProcessRun> RunAsync(string workingDirectory, params string[] args) =>
        RunAsync(workingDirectory, null, args);

    public static Task<ProcessRun> RunAsync(string workingDirectory, IReadOnlyDictionary<string, string?>? environment, params string[] args) =>
        Processes.RunAsync(DotnetHost, [Dll, .. args], workingDirectory, TimeSpan.FromSeconds(120), environment);

    private static string FindHost()
    {
        var host = Environment.GetEnvironmentVariable("DOTNET_HOST_PATH");
        if (!string.IsNullOrEmpty(host) && File.Exists(host))
        {
            return host;
        }

        var self = Environment.ProcessPath;
        return self is not null && Path.GetFileNameWithoutExtension(self) == "dotnet" ? self : "dotnet";
    }
}
