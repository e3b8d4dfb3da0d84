using CsCheck;

namespace FitSpec.Fuzz.Harness;

/// <summary>
/// One entry point under test: how its inputs are generated, how one input is run and judged, and how much
/// time and memory one input may take. Run returns how the input ended when the code behaved; anything it
/// throws is a finding (a <see cref="ContractViolation"/> from its own checks, any other exception from the
/// code under test).
/// </summary>
public interface IFuzzTarget
{
    string Name { get; }

    /// <summary>Extension of a saved input, so a finding opens as what it is (e.g. ".fit.yaml").</summary>
    string FileExtension { get; }

    Gen<FuzzCase> Inputs { get; }

    /// <summary>How long one input may take (a full fit may take longer than a parse).</summary>
    TimeSpan TimeBudget(FuzzCase input);

    /// <summary>Bytes one input may allocate on the thread that runs it.</summary>
    long MemoryBudget { get; }

    Outcome Run(FuzzCase input, Workspace workspace, Tally tally);
}
