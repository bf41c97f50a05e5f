using ExprModel.Core.Models;
using ExprModel.Core.Perturbation;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Workbench's "why and what-if" area without its components: knock-down, sensitivity and fit to recording, each a
/// background job on the model as the Workbench's controls set it when the job starts (<see cref="WorkbenchSession.Current"/>).
/// Tests drive it without a renderer and await each job's <see cref="BackgroundJob.Running"/>.
/// </summary>
public sealed class WhatIfSession : IDisposable
{
    private readonly WorkbenchSession _workbench;

    public WhatIfSession(ModelRunner runner, SimulationGate gate, WorkbenchSession workbench, Func<Task> changed)
    {
        _workbench = workbench;
        Knockdown = new KnockdownRun(runner, gate, Current, changed);
        Sensitivity = new SensitivityRun(runner, gate, Current, changed);
        Fit = new FitRun(runner, gate, Current, (doc, origin) => workbench.Open(doc, origin, null), changed);
    }

    /// <summary>The part shown.</summary>
    public WhatIfPart Shown { get; set; } = WhatIfPart.Knockdown;

    public KnockdownRun Knockdown { get; }
    public SensitivityRun Sensitivity { get; }
    public FitRun Fit { get; }

    /// <summary>The model as the Workbench's controls set it now; null when none is open.</summary>
    public ModelDocument? Current() => _workbench.Model is null ? null : _workbench.Current();

    /// <summary>True when a result was measured on another model or other control settings than the ones now set.</summary>
    public bool IsStale(string? measuredModelJson) => measuredModelJson is not null && Current()?.ToJson() != measuredModelJson;

    /// <summary>Fills the fit's targets with recorded read-outs of the open cell or group (labelled "pre-filled from recordings").</summary>
    public void Prefill(IEnumerable<FitTarget> recorded, double? stepDurationMs = null) => Fit.Prefill(recorded, stepDurationMs);

    /// <summary>Starts the fit, recording where the model came from for the fitted model's origin.</summary>
    public void StartFit() => Fit.Start(_workbench.Origin);

    public void Dispose()
    {
        Knockdown.Dispose();
        Sensitivity.Dispose();
        Fit.Dispose();
    }
}
