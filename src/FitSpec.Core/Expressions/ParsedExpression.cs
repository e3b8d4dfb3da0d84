using System.Collections;

namespace FitSpec.Expressions;

/// <summary>
/// The result of parsing: the tree (null whenever there is any error, so a bad tree is never evaluated) and every
/// error found, ordered by offset.
/// </summary>
public sealed record ParsedExpression(string Text, Expr? Root, IReadOnlyList<ExprError> Errors)
{
    // Keyed on the root it was built from, so a copy made with 'with { Root = ... }' never reports stale names.
    private ColumnCache? _columns;

    public bool Ok => Root is not null && Errors.Count == 0;

    /// <summary>Column names the tree references, compared ordinally, in order of first appearance.</summary>
    public IReadOnlySet<string> Columns
    {
        get
        {
            var root = Root;
            var cache = _columns;
            if (cache is null || !ReferenceEquals(cache.Root, root))
            {
                cache = new ColumnCache(root, NameSet.Collect(root));
                _columns = cache;
            }

            return cache.Names;
        }
    }

    public bool IsConstant => Ok && Columns.Count == 0;

    // Written by hand so the cache does not take part and the error list is compared by content.
    public bool Equals(ParsedExpression? other) =>
        other is not null
        && string.Equals(Text, other.Text, StringComparison.Ordinal)
        && Equals(Root, other.Root)
        && Errors.SequenceEqual(other.Errors);

    public override int GetHashCode() => HashCode.Combine(Text, Root, Errors.Count);

    private sealed record ColumnCache(Expr? Root, NameSet Names);
}

/// <summary>A read-only ordinal set of names that remembers insertion order.</summary>
internal sealed class NameSet : IReadOnlySet<string>
{
    private readonly List<string> _order = [];
    private readonly HashSet<string> _set = new(StringComparer.Ordinal);

    public int Count => _order.Count;

    internal static NameSet Collect(Expr? root)
    {
        var names = new NameSet();
        if (root is null)
        {
            return names;
        }

        // An explicit stack: a tree built by hand need not respect the parser's depth limit.
        var pending = new Stack<Expr>();
        pending.Push(root);
        while (pending.Count > 0)
        {
            switch (pending.Pop())
            {
                case ColumnExpr column:
                    names.Add(column.Name);
                    break;
                case UnaryExpr unary:
                    pending.Push(unary.Operand);
                    break;
                case NotExpr not:
                    pending.Push(not.Operand);
                    break;
                case BinaryExpr binary:
                    pending.Push(binary.Right);
                    pending.Push(binary.Left);
                    break;
                case ComparisonExpr comparison:
                    pending.Push(comparison.Right);
                    pending.Push(comparison.Left);
                    break;
                case LogicalExpr logical:
                    pending.Push(logical.Right);
                    pending.Push(logical.Left);
                    break;
                case CallExpr call:
                    for (var i = call.Arguments.Count - 1; i >= 0; i--)
                    {
                        pending.Push(call.Arguments[i]);
                    }

                    break;
            }
        }

        return names;
    }

    internal void Add(string name)
    {
        if (_set.Add(name))
        {
            _order.Add(name);
        }
    }

    public bool Contains(string item) => _set.Contains(item);

    public IEnumerator<string> GetEnumerator() => _order.GetEnumerator();

    IEnumerator IEnumerable.GetEnumerator() => GetEnumerator();

    public bool IsProperSubsetOf(IEnumerable<string> other) => _set.IsProperSubsetOf(other);

    public bool IsProperSupersetOf(IEnumerable<string> other) => _set.IsProperSupersetOf(other);

    public bool IsSubsetOf(IEnumerable<string> other) => _set.IsSubsetOf(other);

    public bool IsSupersetOf(IEnumerable<string> other) => _set.IsSupersetOf(other);

    public bool Overlaps(IEnumerable<string> other) => _set.Overlaps(other);

    public bool SetEquals(IEnumerable<string> other) => _set.SetEquals(other);
}
