namespace FitSpec.BrowserTests.Support;

/// <summary>All browser tests share one browser and one solve of the demo specs, and run one after another.</summary>
[CollectionDefinition(Name)]
public sealed class BrowserCollection : ICollectionFixture<BrowserSession>, ICollectionFixture<DemoReports>
{
    public const string Name = "browser";
}

/// <summary>Where screenshots go: TestResults/browser beside the test assembly.</summary>
public static class Screenshots
{
    public static string Folder { get; } = Path.Combine(AppContext.BaseDirectory, "TestResults", "browser");

    public static string For(string name) => Path.Combine(Folder, name + ".png");
}
