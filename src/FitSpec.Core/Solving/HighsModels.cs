using FitSpec.Lowering;
using Highs.Native;

namespace FitSpec.Solving;

/// <summary>FitProgram → the HiGHS binding's model (same column-wise layout, so a copy of references).</summary>
internal static class HighsModels
{
    public static HighsModel From(FitProgram p) => new(
        p.NumVars, p.NumRows, p.Offset, p.Cost, p.Lower, p.Upper, p.RowLower, p.RowUpper,
        p.ColStart, p.RowIndex, p.Values,
        p.HasQuadratic ? p.QStart : null,
        p.HasQuadratic ? p.QIndex : null,
        p.HasQuadratic ? p.QValue : null,
        p.HasIntegers ? p.Integer : null);

}

/// <summary>Exports a program with HiGHS's own writer, so another solver can re-solve exactly what was solved.</summary>
public static class ProgramExport
{
    /// <summary>Free MPS for a .mps path (QPs get their quadratic section); the extension picks the format.</summary>
    public static void Write(FitProgram program, string path)
    {
        using var highs = new HighsSolver();
        highs.SetOption("output_flag", false);
        highs.PassModel(HighsModels.From(program));
        highs.WriteModel(path);
    }
}
