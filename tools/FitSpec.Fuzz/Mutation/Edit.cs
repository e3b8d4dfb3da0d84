using CsCheck;

namespace FitSpec.Fuzz.Mutation;

/// <summary>
/// One edit of a seed. Position and Argument are raw numbers that the edit reduces to the input at hand
/// (a byte offset, a snippet index, a depth), so CsCheck shrinks an edit by shrinking plain integers.
/// Kinds below <see cref="Mutator.FirstTransform"/> are the byte-level edits every target shares; higher
/// kinds are the target's own structural transforms, in the order the target lists them.
/// </summary>
public sealed record Edit(int Kind, int Position, int Argument);

/// <summary>Byte-level edits shared by every target.</summary>
public enum ByteEdit
{
    FlipBit,
    SetByte,
    DeleteToken,
    DuplicateToken,
    DeleteLine,
    DuplicateLine,
    SwapLines,
    InsertSnippet,
    ReplaceToken,
    Truncate,
    DeleteRange,
    RepeatRange,
}

/// <summary>CsCheck generators of edit lists, weighted between byte edits and a target's transforms.</summary>
public static class EditGen
{
    /// <summary>
    /// Edits of which about <paramref name="transformWeight"/> in 10 are structural transforms; 0 to
    /// <paramref name="maxEdits"/> of them per input.
    /// </summary>
    public static Gen<Edit[]> Edits(int transformCount, int transformWeight, int maxEdits)
    {
        var byteKinds = Enum.GetValues<ByteEdit>().Length;
        var byteEdit = Gen.Select(Gen.Int[0, byteKinds - 1], Gen.Int[0, 1 << 20], Gen.Int[0, 1 << 16], (k, p, a) => new Edit(k, p, a));
        if (transformCount == 0)
        {
            return byteEdit.Array[0, maxEdits];
        }

        var transform = Gen.Select(Gen.Int[0, transformCount - 1], Gen.Int[0, 1 << 20], Gen.Int[0, 1 << 16], (k, p, a) => new Edit(Mutator.FirstTransform + k, p, a));
        return Gen.Frequency((10 - transformWeight, byteEdit), (transformWeight, transform)).Array[0, maxEdits];
    }
}
