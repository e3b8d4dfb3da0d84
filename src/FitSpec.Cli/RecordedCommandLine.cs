using FitSpec.Cluster;

namespace FitSpec.Cli;

/// <summary>
/// The command line a result records: `fitspec` and the arguments as given, less the options that only
/// schedule the work (--jobs N, --shard I/N, --force), so that they never make two runs' files differ.
/// </summary>
internal static class RecordedCommandLine
{
    private static readonly string[] WithValue = ["--jobs", "--shard"];
    private static readonly string[] Flags = ["--force"];

    public static string Of(IReadOnlyList<string> args)
    {
        var kept = new List<string> { "fitspec" };
        for (var i = 0; i < args.Count; i++)
        {
            var arg = args[i];
            if (WithValue.Contains(arg, StringComparer.Ordinal))
            {
                i++; // and its value
                continue;
            }

            if (Flags.Contains(arg, StringComparer.Ordinal))
            {
                // A flag may be given an explicit true/false, which then belongs to it.
                if (i + 1 < args.Count && bool.TryParse(args[i + 1], out _))
                {
                    i++;
                }

                continue;
            }

            if (WithValue.Concat(Flags).Any(o => arg.StartsWith(o + "=", StringComparison.Ordinal) || arg.StartsWith(o + ":", StringComparison.Ordinal)))
            {
                continue;
            }

            kept.Add(ShellWords.Quote(arg)); // quoted for a POSIX shell, so the line can be pasted back
        }

        return string.Join(' ', kept);
    }
}
