using FitSpec.Diagnostics;
using YamlDotNet.Core;
using YamlDotNet.Core.Events;

namespace FitSpec.Spec;

/// <summary>
/// A first pass over the YAML events, before any tree is built, that refuses the two shapes the tree loader
/// cannot survive: nesting so deep that its recursion overflows the stack (which ends the process, past any
/// catch), and anchors whose aliases repeat them into an exponentially large document (an alias bomb: a few
/// lines that every later walk over the tree would expand), and aliases to a list or mapping from inside
/// it ('&amp;a [x, *a]'), which make the tree a cycle that the YAML library's own hashing of a mapping key
/// follows until the stack overflows. The event parser itself does not recurse.
/// </summary>
internal static class YamlLimits
{
    /// <summary>Lists and mappings inside each other; a fit spec needs about five levels.</summary>
    public const int MaxNesting = 100;

    /// <summary>Nodes that aliases may repeat, counted with everything inside the anchored node.</summary>
    public const int MaxAliasedNodes = 10_000;

    /// <summary>Records the first limit the text breaks, at the place it breaks it; true when it keeps both.</summary>
    public static bool Check(string path, string text, List<Diagnostic> errors)
    {
        var parser = new Parser(new StringReader(text));
        var open = new Stack<(AnchorName Anchor, long Nodes)>();
        var sizes = new Dictionary<AnchorName, long>();
        long aliased = 0;
        while (parser.MoveNext())
        {
            var current = parser.Current!;
            switch (current)
            {
                case MappingStart or SequenceStart:
                    if (open.Count >= MaxNesting)
                    {
                        return Refuse(path, current.Start, errors, $"lists and mappings are nested more than {MaxNesting} levels deep; a fit spec needs only a few");
                    }

                    var opened = ((NodeEvent)current).Anchor;

                    // An alias names the latest node with its anchor: from here on, that is this one.
                    sizes.Remove(opened);
                    open.Push((opened, 1));
                    break;
                case MappingEnd or SequenceEnd when open.Count > 0:
                    var (anchor, nodes) = open.Pop();
                    Remember(sizes, anchor, nodes);
                    Add(open, nodes);
                    break;
                case Scalar scalar:
                    Remember(sizes, scalar.Anchor, 1);
                    Add(open, 1);
                    break;
                case AnchorAlias alias when !sizes.ContainsKey(alias.Value) && open.Any(o => o.Anchor == alias.Value):
                    return Refuse(path, alias.Start, errors, $"the alias '*{alias.Value}' is inside the value it names, so that value would contain itself; write it out instead");
                case AnchorAlias alias:
                    // An alias to an unknown anchor is the loader's error to report.
                    var repeated = sizes.GetValueOrDefault(alias.Value, 1);
                    aliased += repeated;
                    if (aliased > MaxAliasedNodes)
                    {
                        return Refuse(path, alias.Start, errors, $"aliases ('*name') repeat more than {MaxAliasedNodes} values; write the values out instead of repeating anchors inside anchors");
                    }

                    Add(open, repeated);
                    break;
            }
        }

        return true;
    }

    private static void Remember(Dictionary<AnchorName, long> sizes, AnchorName anchor, long nodes)
    {
        if (!anchor.IsEmpty)
        {
            sizes[anchor] = nodes;
        }
    }

    private static void Add(Stack<(AnchorName Anchor, long Nodes)> open, long nodes)
    {
        if (open.TryPop(out var parent))
        {
            open.Push((parent.Anchor, parent.Nodes + nodes));
        }
    }

    private static bool Refuse(string path, Mark at, List<Diagnostic> errors, string message)
    {
        errors.Add(new Diagnostic(path, (int)at.Line, (int)at.Column, null, message));
        return false;
    }
}
