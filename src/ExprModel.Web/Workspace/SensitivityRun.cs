using ExprModel.Core.Models;
using ExprModel.Core.Perturbation;
using ExprModel.Web.Export;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Workbench's sensitivity matrix (the library's <see cref="Sensitivity"/>: every read-out against every channel's
/// density) with what the page says beside it: which columns are per unit rather than log ratios, which read-outs are
/// quantised and the smallest entry they resolve.
/// </summary>
public sealed class SensitivityRun(ModelRunner runner, SimulationGate gate, Func<ModelDocument?> current, Func<Task> changed) : IDisposable
{
    public BackgroundJob Job { get; } = new(gate, changed);
    public SensitivityMatrix? Matrix { get; private set; }
    public string? MeasuredModelJson { get; private set; }
    public string MeasuredModelName { get; private set; } = "";

    /// <summary>Measures the matrix of the model as the controls set it now (1 + 2 x channels model variants).</summary>
    public void Start()
    {
        if (current() is not { } doc) return;
        Job.Start((checkpoint, token) =>
        {
            var cell = runner.Compile(doc).Model;
            Job.Report(0, 1 + 2 * cell.Channels.Count);
            return Sensitivity.Run(cell, SensitivitySettings.Default, (done, all) => { Job.Report(done, all); checkpoint(); }, token);
        }, matrix =>
        {
            Matrix = matrix;
            MeasuredModelJson = doc.ToJson();
            MeasuredModelName = doc.Name;
        });
    }

    /// <summary>Columns whose entries are in the read-out's unit per unit ln(density), not log ratios.</summary>
    public IReadOnlyList<SensitivityColumn> PerUnitColumns() =>
        Matrix?.Columns.Where(c => c.Kind == ElasticityKind.PerLogDensity).ToArray() ?? [];

    /// <summary>Columns found by grid searches, with the smallest entry their grid resolves.</summary>
    public IReadOnlyList<SensitivityColumn> QuantisedColumns() =>
        Matrix?.Columns.Where(c => c.Resolution is not null).ToArray() ?? [];

    /// <summary>Channels x read-outs as CSV (the library's table, as `exprmodel sensitivity`), with the caution; null before a run.</summary>
    public DownloadFile? Csv() =>
        Matrix is null ? null : new("sensitivity.csv", "text/csv", Matrix.ToCsv([ResearchCaution.Text, $"model: {MeasuredModelName}"]));

    public void Dispose() => Job.Dispose();
}
