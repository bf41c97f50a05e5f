using ExprModel.Core.Cell;

namespace ExprModel.Core.Simulation;

/// <summary>
/// Compiles cells, reusing the kinetics (step plan, rate tables) of a recently compiled model that differs only in
/// channel densities (<see cref="CellKinetics.Matches"/>), so a relative-density change costs one array of densities,
/// not a compilation. Keeps the most recently used <see cref="Capacity"/> kinetics. Thread-safe.
/// </summary>
public sealed class KineticsCache(int capacity = 16)
{
    private readonly LinkedList<CellKinetics> _recent = new();
    private int _built;

    public int Capacity { get; } = capacity > 0 ? capacity : throw new ArgumentOutOfRangeException(nameof(capacity), "capacity must be positive");

    /// <summary>How many kinetics this cache has compiled (a density change compiles none).</summary>
    public int KineticsBuilt => Volatile.Read(ref _built);

    /// <summary>The compiled cell of <paramref name="model"/>, on shared kinetics when a recent model matches.</summary>
    /// <exception cref="ModelException">The model cannot be simulated (names the parameter).</exception>
    public CompiledCell Compile(CellModel model)
    {
        CompiledCell.Checked(model);
        lock (_recent)
        {
            for (var node = _recent.First; node is not null; node = node.Next)
            {
                if (!node.Value.Matches(model)) continue;
                _recent.Remove(node);
                _recent.AddFirst(node);
                return CompiledCell.On(node.Value, model);
            }
        }
        var cell = new CompiledCell(model);
        Interlocked.Increment(ref _built);
        lock (_recent)
        {
            _recent.AddFirst(cell.Kinetics);
            if (_recent.Count > Capacity) _recent.RemoveLast();
        }
        return cell;
    }
}
