using ExprModel.Core.Models;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>The Workbench's pinned variants (up to <see cref="Max"/>, each with its colour) and the group comparison that fills them.</summary>
public sealed class VariantSet : IDisposable
{
    public const int Max = 4;
    private static readonly string[] Colors = ["#c8553d", "#2a7f62", "#7b5ea7", "#d49a2a"];

    private readonly List<Variant> _items = [];
    private CancellationTokenSource? _compareCts;

    public IReadOnlyList<Variant> Items => _items;
    public int Count => _items.Count;
    public bool IsFull => _items.Count >= Max;

    /// <summary>True while <see cref="CompareGroupsAsync"/> runs; <see cref="CompareTotal"/> groups are on their way.</summary>
    public bool Comparing { get; private set; }
    public int CompareTotal { get; private set; }

    /// <summary>Pins a variant in the next free colour; names longer than <paramref name="maxNameLength"/> are cut with an ellipsis.</summary>
    public void Add(string name, StepView step, IReadOnlyList<FiRow>? fi, IReadOnlyList<ReadoutRow> readouts, int maxNameLength)
    {
        if (IsFull) return;
        var shown = name.Length > maxNameLength ? name[..(maxNameLength - 1)] + "…" : name;
        _items.Add(new Variant(shown, Colors[_items.Count], step, fi, readouts));
    }

    /// <summary>Removes a variant; the others keep their order and take the colours in turn.</summary>
    public void Remove(Variant v)
    {
        _items.Remove(v);
        var recoloured = _items.Select((x, i) => x with { Color = Colors[i] }).ToList();
        _items.Clear();
        _items.AddRange(recoloured);
    }

    public void Clear() => _items.Clear();

    /// <summary>
    /// Pins the first <see cref="Max"/> groups' models, one after another; <paramref name="pinned"/> follows each pin,
    /// <paramref name="changed"/> each step shown, and <see cref="CancelCompare"/> stops between and during runs (the
    /// groups already pinned stay).
    /// </summary>
    /// <param name="customFi">The user's own f-I sweep, or null to show the read-outs' standard sweep.</param>
    public async Task CompareGroupsAsync(ModelRunner runner, IReadOnlyDictionary<string, ModelDocument> groups, StepProtocol protocol, FiProtocol? customFi,
        Func<Task> changed, Action pinned, Action<string> failed)
    {
        _compareCts?.Cancel();
        _compareCts?.Dispose();
        _compareCts = new CancellationTokenSource();
        var token = _compareCts.Token;
        _items.Clear();
        Comparing = true;
        CompareTotal = Math.Min(Max, groups.Count);
        await changed();
        try
        {
            foreach (var (name, model) in groups.Take(Max))
            {
                var step = await runner.StepAsync(model, protocol, token);
                var set = await runner.ReadoutsAsync(model, token, useCache: true);
                var fi = customFi is not null ? await runner.FiAsync(model, customFi, token) : set.Fi;
                token.ThrowIfCancellationRequested();
                Add(name, step, fi, set.Rows, 24);
                pinned();
                await changed();
            }
        }
        catch (OperationCanceledException) { }
        catch (Exception e) when (e is UserInputException or SimulationTimeoutException) { failed(e.Message); }
        Comparing = false;
        await changed();
    }

    public void CancelCompare()
    {
        _compareCts?.Cancel();
        Comparing = false;
    }

    public void Dispose()
    {
        _compareCts?.Cancel();
        _compareCts?.Dispose();
    }
}
