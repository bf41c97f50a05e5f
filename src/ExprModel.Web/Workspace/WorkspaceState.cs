using ExprModel.Core.Models;

namespace ExprModel.Web.Workspace;

/// <summary>One user's work in progress in this browser tab (a Blazor circuit): the loaded table, built models, the Workbench model.</summary>
public sealed class WorkspaceState
{
    /// <summary>The model open on the Workbench, and where it came from ("preset hh1952", "group Pv-fast", "shared model ...").</summary>
    public ModelDocument? Model { get; private set; }
    public string ModelOrigin { get; private set; } = "";
    /// <summary>The shared snapshot the Workbench model was opened from; saving an edit records it as the parent.</summary>
    public string? ParentSnapshotId { get; private set; }
    /// <summary>
    /// The cell or group the Workbench model was built for (null for a published, imported or shared model): what its
    /// recorded values belong to.
    /// </summary>
    public ExprModel.Core.Mapping.ModelTarget? ModelTarget { get; private set; }

    /// <summary>
    /// The uploaded expression files as received (kept only in this tab unless the user stores them with a snapshot): one
    /// table, one archive, or a Matrix Market matrix with its sidecar files.
    /// </summary>
    public IReadOnlyList<UploadedFile> ExpressionFiles { get; private set; } = [];

    /// <summary>The upload as one file, as a snapshot stores it: the file itself, or several files packed into one zip.</summary>
    public byte[]? ExpressionBytes => ExpressionFiles.Count switch
    {
        0 => null,
        1 => ExpressionFiles[0].Bytes,
        _ => _packed ??= UploadArchive.Pack(ExpressionFiles),
    };

    /// <summary>The name of <see cref="ExpressionBytes"/>.</summary>
    public string? ExpressionName => ExpressionFiles.Count switch { 0 => null, 1 => ExpressionFiles[0].Name, _ => PackedName };

    /// <summary>How pages name the upload: the file, or the files.</summary>
    public string? ExpressionLabel => ExpressionFiles.Count == 0 ? null : string.Join(" + ", ExpressionFiles.Select(f => f.Name));

    /// <summary>The stored name of several files packed together.</summary>
    public const string PackedName = "expression-files.zip";

    private byte[]? _packed;

    /// <summary>A new upload (one file or several); forgets what was derived from the previous one.</summary>
    public void SetExpression(IReadOnlyList<UploadedFile> files)
    {
        ExpressionFiles = files;
        _packed = null;
        ResetDerived();
    }
    public byte[]? MetadataBytes { get; set; }
    public string? MetadataName { get; set; }

    /// <summary>Models built from the expression table, by group (or cell) name, for the Workbench's comparison overlay.</summary>
    public Dictionary<string, ModelDocument> GroupModels { get; } = new(StringComparer.Ordinal);

    /// <summary>The Workbench protocols area's protocol last run, or the one a shared link stored; a share stores it.</summary>
    public InjectedProtocol? Injected { get; set; }

    /// <summary>The user's answers on the Load page (blank = detect).</summary>
    public IntakeChoices Intake { get; } = new();

    /// <summary>The table as read and mapped (null until the Map page reads it), the user's overrides and rule.</summary>
    public ExpressionSession? Session { get; set; }
    public List<ExprModel.Core.Mapping.GeneOverride> Overrides { get; } = [];
    public ExprModel.Core.Mapping.DensityRule Rule { get; set; } = new();
    /// <summary>Built models with their derivations and warnings, by target label.</summary>
    public Dictionary<string, ExprModel.Core.Mapping.BuiltModel> Built { get; } = new(StringComparer.Ordinal);

    /// <summary>Recorded features and sweeps loaded on the Load page; <see cref="RecordedData.ValuesFor"/> gives a target's recorded values.</summary>
    public RecordedData Recorded { get; } = new();

    /// <summary>Forgets everything derived from the loaded table (a new table or new read choices).</summary>
    public void ResetDerived()
    {
        Session = null;
        Overrides.Clear();
        Built.Clear();
        GroupModels.Clear();
    }

    public event Action? Changed;

    /// <param name="target">The cell or group the model was built for, when it was built from the loaded table.</param>
    public void Open(ModelDocument model, string origin, string? parentSnapshotId = null, ExprModel.Core.Mapping.ModelTarget? target = null)
    {
        Model = model;
        ModelOrigin = origin;
        ParentSnapshotId = parentSnapshotId;
        ModelTarget = target;
        Changed?.Invoke();
    }
}
