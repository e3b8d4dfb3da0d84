namespace FitSpec.BrowserTests.Support;

/// <summary>
/// The Debian Chromium the browser tests drive, and what its absence means: a failure under CI (the CI script
/// installs it), a skip with the reason anywhere else.
/// </summary>
public static class Chromium
{
    /// <summary>Names another Chromium executable (e.g. on a distribution that installs it elsewhere).</summary>
    public const string OverrideVariable = "FITSPEC_CHROMIUM";

    public const string DefaultExecutable = "/usr/bin/chromium";

    public static string Executable { get; } =
        Environment.GetEnvironmentVariable(OverrideVariable) is { Length: > 0 } chosen ? chosen : DefaultExecutable;

    public static bool IsPresent => File.Exists(Executable);

    /// <summary>CI runs set CI=true; there a missing browser is a broken machine, not a reason to skip.</summary>
    public static bool UnderCi =>
        Environment.GetEnvironmentVariable("CI") is { } ci
        && (ci.Equals("true", StringComparison.OrdinalIgnoreCase) || ci == "1");

    public static string MissingReason =>
        $"Chromium not found at {Executable}: install the Debian package chromium (apt-get install chromium) "
        + $"or set {OverrideVariable} to a Chromium executable";

    /// <summary>The skip reason for a browser test, or null when it must run (browser present, or under CI).</summary>
    public static string? SkipReason =>
        IsPresent || UnderCi ? null : MissingReason + " (skipped because CI is not 'true'; under CI this test fails)";

    /// <summary>Throws the clear message when the browser is missing (reached only when the test was not skipped).</summary>
    public static void Require()
    {
        if (!IsPresent)
        {
            throw new InvalidOperationException(MissingReason + (UnderCi ? " (CI=true: the browser tests require it; .ci/run installs it)" : ""));
        }
    }
}

/// <summary>A fact that needs Chromium: skipped with the reason when it is missing, except under CI.</summary>
public sealed class BrowserFactAttribute : FactAttribute
{
    public BrowserFactAttribute()
    {
        if (Chromium.SkipReason is { } reason)
        {
            Skip = reason;
        }
    }
}

/// <summary>A theory that needs Chromium: skipped with the reason when it is missing, except under CI.</summary>
public sealed class BrowserTheoryAttribute : TheoryAttribute
{
    public BrowserTheoryAttribute()
    {
        if (Chromium.SkipReason is { } reason)
        {
            Skip = reason;
        }
    }
}
