using System.Security.Cryptography;

namespace FitSpec.ClusterTests.Support;

/// <summary>The files under an out folder, by path relative to it ('/'-separated), as content hashes.</summary>
public static class OutputTree
{
    public static SortedDictionary<string, string> Read(string root, Func<string, bool>? excluded = null)
    {
        var files = new SortedDictionary<string, string>(StringComparer.Ordinal);
        foreach (var file in Directory.EnumerateFiles(root, "*", SearchOption.AllDirectories))
        {
            var relative = Path.GetRelativePath(root, file).Replace('\\', '/');
            if (excluded?.Invoke(relative) == true)
            {
                continue;
            }

            files[relative] = Convert.ToHexString(SHA256.HashData(File.ReadAllBytes(file)));
        }

        return files;
    }

    /// <summary>Asserts both trees hold the same paths with the same bytes, naming the first differences.</summary>
    public static void AssertIdentical(string expectedRoot, SortedDictionary<string, string> expected, string actualRoot, SortedDictionary<string, string> actual)
    {
        var onlyExpected = expected.Keys.Except(actual.Keys).ToList();
        var onlyActual = actual.Keys.Except(expected.Keys).ToList();
        var differing = expected.Keys.Intersect(actual.Keys).Where(k => expected[k] != actual[k]).ToList();
        if (onlyExpected.Count + onlyActual.Count + differing.Count == 0)
        {
            return;
        }

        var message = $"{expectedRoot} and {actualRoot} differ:"
            + $"{Environment.NewLine}  only in the first ({onlyExpected.Count}): {string.Join(", ", onlyExpected.Take(10))}"
            + $"{Environment.NewLine}  only in the second ({onlyActual.Count}): {string.Join(", ", onlyActual.Take(10))}"
            + $"{Environment.NewLine}  different bytes ({differing.Count}): {string.Join(", ", differing.Take(10))}";
        if (differing.Count > 0)
        {
            message += Environment.NewLine + FirstDifference(Path.Combine(expectedRoot, differing[0]), Path.Combine(actualRoot, differing[0]));
        }

        Assert.Fail(message);
    }

    private static string FirstDifference(string a, string b)
    {
        var left = File.ReadAllLines(a);
        var right = File.ReadAllLines(b);
        for (var i = 0; i < Math.Max(left.Length, right.Length); i++)
        {
            var l = i < left.Length ? left[i] : "<end>";
            var r = i < right.Length ? right[i] : "<end>";
            if (l != r)
            {
                return $"  first differing line {i + 1} of {Path.GetFileName(a)}:{Environment.NewLine}    {Clip(l)}{Environment.NewLine}    {Clip(r)}";
            }
        }

        return "  (same lines, different line endings or bytes)";
    }

    private static string Clip(string line) => line.Length > 300 ? line[..300] + "…" : line;
}
