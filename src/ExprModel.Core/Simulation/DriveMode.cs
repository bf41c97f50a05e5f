namespace ExprModel.Core.Simulation;

/// <summary>How a channel's current is computed in the hot loop.</summary>
internal enum DriveMode : byte
{
    /// <summary>g (V - E) with a constant E.</summary>
    Ohmic,
    /// <summary>g (V - E_Ca) with E_Ca from the Nernst equation and the shell's current calcium.</summary>
    NernstCalcium,
    /// <summary>g * GHK(V, ca_in, ca_out).</summary>
    GhkCalcium,
}
