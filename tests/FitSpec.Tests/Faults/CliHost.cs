namespace FitSpec.Tests.Faults;

/// <summary>The dotnet host to run the built CLI with: the one running the tests when it can be found.</summary>
public static class CliHost
{
    public static string Dotnet()
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
