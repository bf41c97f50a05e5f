using ExprModel.Core.Models;
using ExprModel.Data.Store;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Workbench's share link: stores the current model as a snapshot and, when the stored read-outs differ from the
/// live table, switches the table to what the link holds and keeps a note of what changed. <paramref name="changed"/>
/// is the session's re-render callback.
/// </summary>
public sealed class WorkbenchShare(WorkspaceState workspace, Func<Task> changed)
{
    /// <summary>The snapshot the last share created, and the note shown when its stored read-outs differ from the live table.</summary>
    public string? SnapshotId { get; private set; }
    public string? Note { get; private set; }
    public bool InProgress { get; private set; }

    /// <summary>Another model was opened: its link is still to be made.</summary>
    internal void Forget() => SnapshotId = null;

    /// <summary>A setting moved: the note described the table at the moment of sharing.</summary>
    internal void ForgetNote() => Note = null;

    /// <summary>
    /// Stores <paramref name="session"/>'s current model as a share link. The link stores an unseeded measurement; the
    /// live table's rheobase search started from the previous setting's rheobase, and the two agree unless spiking is not
    /// monotone in the step amplitude. When they do not, the table switches to what the link holds (if the settings have
    /// not moved meanwhile) and <see cref="Note"/> says what changed.
    /// </summary>
    public async Task ShareAsync(WorkbenchSession session, SnapshotService snapshots, string notes, bool storeExpression)
    {
        InProgress = true;
        try
        {
            byte[]? expression = storeExpression ? workspace.ExpressionBytes : null;
            var model = session.Current();
            string modelJson = model.ToJson();
            // The live table, if it is complete and belongs to the model being shared.
            var live = !session.Busy && session.Table.Pending.Count == 0 ? session.Table.Rows : null;
            var protocol = new SnapshotProtocol { Step = session.Protocol, Fi = session.Fi, Injected = workspace.Injected };
            var (snap, stored) = await snapshots.SaveAsync(model, protocol, notes, workspace.ParentSnapshotId,
                expression, storeExpression ? workspace.ExpressionName : null, CancellationToken.None, SnapshotRecorded.Of(workspace));
            SnapshotId = snap.Id;
            Note = null;
            session.Error = null;
            if (live is not null
                && !session.Busy
                && session.Current().ToJson() == modelJson
                && ReadoutComparison.Changes(live, stored.Rows) is { Count: > 0 } changes)
            {
                Note = StoredReadoutsNote.For(changes);
                session.ShowStored(model, stored);
            }
        }
        catch (Exception e) when (e is UserInputException or SimulationTimeoutException or SnapshotStoreException) { session.Error = e.Message; }
        finally { InProgress = false; }
        await changed();
    }
}
