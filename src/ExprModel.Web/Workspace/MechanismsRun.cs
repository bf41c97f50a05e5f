using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Models;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Workbench's adaptation-mechanisms panel state: runs the library's protocol (<see cref="AdaptationMechanisms"/>) on the
/// model as the controls set it when asked, and keeps the result with the JSON of the model it was measured on.
/// </summary>
public sealed class MechanismsRun(ModelRunner runner, Func<Task> changed)
{
    public MechanismReport? Report { get; private set; }
    public Geometry? Geometry { get; private set; }
    public string? ModelName { get; private set; }
    public string? MeasuredModelJson { get; private set; }
    public string? Error { get; private set; }
    public bool Running => Job is { IsCompleted: false };
    /// <summary>The latest run (tests await it).</summary>
    public Task? Job { get; private set; }

    /// <summary>Starts a run on <paramref name="doc"/> at the given step (uA/cm2; null = twice the rheobase).</summary>
    public Task Start(ModelDocument doc, double? stepUaPerCm2)
    {
        if (Running) return Job!;
        Error = null;
        Job = RunAsync(doc, stepUaPerCm2);
        return Job;
    }

    private async Task RunAsync(ModelDocument doc, double? stepUaPerCm2)
    {
        await changed();
        try
        {
            var (report, geometry) = await runner.MechanismsAsync(doc, stepUaPerCm2, null, CancellationToken.None);
            (Report, Geometry, ModelName, MeasuredModelJson) = (report, geometry, doc.Name, doc.ToJson());
        }
        catch (Exception e) when (e is UserInputException or SimulationTimeoutException)
        {
            Error = e.Message;
        }
        await changed();
    }
}
