namespace ExprModel.Core.Analysis;

/// <summary>
/// Follows a sequence of measured models (each a small change of the one before) and keeps where the next one's
/// rheobase search should start: the newest <see cref="RheobaseHint"/>. A model whose spiking is not monotone in the
/// step amplitude drops it, so the next search starts from scratch (see <see cref="CellReadouts.Hint"/>); a model
/// without a hint of its own (one that never fires, say) keeps the one before.
/// </summary>
public sealed class RheobaseHintTrail
{
    /// <summary>Where the next search starts; null means from scratch.</summary>
    public RheobaseHint? Current { get; private set; }

    /// <summary>Takes in one model's measurement (first stage or complete).</summary>
    public void Observe(RheobaseHint? hint, bool spikingNotMonotone)
    {
        if (spikingNotMonotone) Current = null;
        else if (hint is not null) Current = hint;
    }

    public void Observe(CellReadouts readouts) => Observe(readouts.Hint, readouts.SpikingNotMonotone);

    /// <summary>Starts a new sequence (another model opened): its first search runs from scratch.</summary>
    public void Forget() => Current = null;
}
