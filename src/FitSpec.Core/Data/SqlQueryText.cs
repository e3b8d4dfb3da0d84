namespace FitSpec.Data;

/// <summary>
/// What the data stage needs to know about a query's text before SQLite sees it: its first keyword, past
/// white space and comments. Only queries that start like a SELECT are run; SQLite itself then confirms
/// that the statement reads only (see <see cref="SqliteQueryReader"/>).
/// </summary>
internal static class SqlQueryText
{
    /// <summary>The words a reading query may start with: SELECT, a WITH clause before one, or VALUES.</summary>
    public static IReadOnlyList<string> ReadingKeywords { get; } = ["SELECT", "WITH", "VALUES"];

    /// <summary>The first word of the query in upper case, or "" when it holds only white space and comments.</summary>
    public static string FirstKeyword(string query)
    {
        ArgumentNullException.ThrowIfNull(query);
        var i = 0;
        while (i < query.Length)
        {
            if (char.IsWhiteSpace(query[i]))
            {
                i++;
            }
            else if (query.AsSpan(i).StartsWith("--"))
            {
                var end = query.IndexOf('\n', i);
                i = end < 0 ? query.Length : end + 1;
            }
            else if (query.AsSpan(i).StartsWith("/*"))
            {
                var end = query.IndexOf("*/", i + 2, StringComparison.Ordinal);
                i = end < 0 ? query.Length : end + 2;
            }
            else
            {
                break;
            }
        }

        var start = i;
        while (i < query.Length && (char.IsAsciiLetterOrDigit(query[i]) || query[i] == '_'))
        {
            i++;
        }

        // A statement that starts with a symbol, e.g. '(', is shown by that symbol.
        if (i == start && start < query.Length)
        {
            i++;
        }

        return query[start..i].ToUpperInvariant();
    }

    public static bool StartsLikeRead(string query) =>
        ReadingKeywords.Contains(FirstKeyword(query), StringComparer.Ordinal);

    /// <summary>The query on one line (runs of white space as one space), for results and reports.</summary>
    public static string OneLine(string query) =>
        string.Join(' ', (query ?? "").Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries));
}
