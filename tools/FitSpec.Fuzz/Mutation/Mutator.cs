namespace FitSpec.Fuzz.Mutation;

/// <summary>A target's structural edit: (input, position, argument) → new input.</summary>
public delegate byte[] Transform(byte[] data, int position, int argument);

/// <summary>
/// Applies edit lists to seed bytes: the shared byte-level edits (with the target's snippets) and the
/// target's transforms. Pure and deterministic, so an input is reproduced from its seed and edit list alone.
/// The result is cut to <see cref="MaxBytes"/> so no input can ask the harness for unbounded memory.
/// </summary>
public sealed class Mutator
{
    /// <summary>Edit kinds from here on are the target's transforms.</summary>
    public const int FirstTransform = 100;

    private static readonly byte[] InterestingBytes =
    [
        0x00, 0x01, 0x7F, 0x80, 0xBF, 0xC0, 0xC3, 0xED, 0xFE, 0xFF,
        (byte)'\t', (byte)'\r', (byte)'\n', (byte)' ', (byte)':', (byte)'-', (byte)'[', (byte)']', (byte)'{',
        (byte)'}', (byte)'&', (byte)'*', (byte)'!', (byte)'|', (byte)'>', (byte)'"', (byte)'\'', (byte)'#',
        (byte)'%', (byte)'@', (byte)'`', (byte)'?', (byte)',', (byte)'\\', (byte)'0', (byte)'9', (byte)'e', (byte)'.',
    ];

    private readonly IReadOnlyList<byte[]> _snippets;
    private readonly IReadOnlyList<Transform> _transforms;

    public Mutator(IReadOnlyList<byte[]> snippets, IReadOnlyList<Transform> transforms, int maxBytes)
    {
        _snippets = snippets;
        _transforms = transforms;
        MaxBytes = maxBytes;
    }

    public int MaxBytes { get; }

    public int TransformCount => _transforms.Count;

    public byte[] Apply(byte[] seed, IReadOnlyList<Edit> edits)
    {
        ArgumentNullException.ThrowIfNull(seed);
        ArgumentNullException.ThrowIfNull(edits);
        var data = seed;
        foreach (var edit in edits)
        {
            data = edit.Kind >= FirstTransform
                ? _transforms[(edit.Kind - FirstTransform) % _transforms.Count](data, edit.Position, edit.Argument)
                : ApplyByteEdit(data, (ByteEdit)edit.Kind, edit.Position, edit.Argument);
            if (data.Length > MaxBytes)
            {
                data = data[..MaxBytes];
            }
        }

        return data;
    }

    private byte[] ApplyByteEdit(byte[] data, ByteEdit kind, int position, int argument)
    {
        if (data.Length == 0 && kind is not ByteEdit.InsertSnippet)
        {
            return data;
        }

        var at = data.Length == 0 ? 0 : position % data.Length;
        switch (kind)
        {
            case ByteEdit.FlipBit:
                {
                    var copy = (byte[])data.Clone();
                    copy[at] ^= (byte)(1 << (argument % 8));
                    return copy;
                }

            case ByteEdit.SetByte:
                {
                    var copy = (byte[])data.Clone();
                    copy[at] = InterestingBytes[argument % InterestingBytes.Length];
                    return copy;
                }

            case ByteEdit.DeleteToken:
                {
                    var (start, end) = Bytes.TokenAt(data, at);
                    return Bytes.Splice(data, start, end - start, []);
                }

            case ByteEdit.DuplicateToken:
                {
                    var (start, end) = Bytes.TokenAt(data, at);
                    return Bytes.Splice(data, end, 0, data[start..end]);
                }

            case ByteEdit.DeleteLine:
                {
                    var (start, end) = Bytes.LineAt(data, at);
                    return Bytes.Splice(data, start, end - start, []);
                }

            case ByteEdit.DuplicateLine:
                {
                    var (start, end) = Bytes.LineAt(data, at);
                    return Bytes.Splice(data, end, 0, data[start..end]);
                }

            case ByteEdit.SwapLines:
                {
                    var first = Bytes.LineAt(data, at);
                    var second = Bytes.LineAt(data, argument % data.Length);
                    if (first.Start == second.Start)
                    {
                        return data;
                    }

                    var (a, b) = first.Start < second.Start ? (first, second) : (second, first);
                    if (a.End > b.Start)
                    {
                        return data;
                    }

                    return [.. data[..a.Start], .. data[b.Start..b.End], .. data[a.End..b.Start], .. data[a.Start..a.End], .. data[b.End..]];
                }

            case ByteEdit.InsertSnippet:
                return _snippets.Count == 0 ? data : Bytes.Splice(data, at, 0, _snippets[argument % _snippets.Count]);

            case ByteEdit.ReplaceToken:
                {
                    if (_snippets.Count == 0)
                    {
                        return data;
                    }

                    var (start, end) = Bytes.TokenAt(data, at);
                    return Bytes.Splice(data, start, end - start, _snippets[argument % _snippets.Count]);
                }

            case ByteEdit.Truncate:
                return data[..at];

            case ByteEdit.DeleteRange:
                {
                    var length = Math.Min(1 + (argument % 64), data.Length - at);
                    return Bytes.Splice(data, at, length, []);
                }

            default:
                {
                    // Repeats a short range many times: long lines, long tokens and big files from small seeds.
                    var length = Math.Min(1 + (argument % 16), data.Length - at);
                    var times = 1 + (argument / 16 % 4096);
                    var piece = data.AsSpan(at, length);
                    var repeated = new byte[Math.Min((long)piece.Length * times, MaxBytes)];
                    for (var i = 0; i < repeated.Length; i++)
                    {
                        repeated[i] = piece[i % piece.Length];
                    }

                    return Bytes.Splice(data, at, 0, repeated);
                }
        }
    }
}
