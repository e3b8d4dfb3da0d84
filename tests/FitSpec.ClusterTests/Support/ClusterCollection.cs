namespace FitSpec.ClusterTests.Support;

/// <summary>
/// The tests share one spec batch and its single-process reference run, and run one after another, so the
/// wall times they measure are not shared with other tests of this project.
/// </summary>
[CollectionDefinition(Name)]
public sealed class ClusterCollection : ICollectionFixture<BatchFixture>
{
    public const string Name = "cluster";
}
