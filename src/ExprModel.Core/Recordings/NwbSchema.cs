namespace ExprModel.Core.Recordings;

/// <summary>
/// Names from the published NWB 2.x schema (nwb-schema, core namespace: nwb.file.yaml, nwb.base.yaml,
/// nwb.icephys.yaml) that the reader and the writer share. A TimeSeries holds a "data" dataset with the attributes
/// "unit", "conversion" (float32, default 1) and "offset" (float32, default 0), so values in the unit are
/// data x conversion + offset; its timing is a scalar "starting_time" (seconds) with a "rate" attribute (Hz, float32),
/// or a "timestamps" dataset. A PatchClampSeries adds the attribute "sweep_number" (uint32) and a link "electrode" to an
/// IntracellularElectrode (whose optional "cell_id" dataset names the cell). Typed groups carry the attributes
/// "neurodata_type", "namespace" and "object_id".
/// </summary>
public static class NwbSchema
{
    public const string Version = "2.7.0";
    public const string Namespace = "core";

    public const string Acquisition = "acquisition";
    public const string Stimulus = "stimulus";
    public const string Presentation = "presentation";
    public const string Templates = "templates";
    public const string General = "general";
    public const string IntracellularEphys = "intracellular_ephys";
    public const string Devices = "devices";

    public const string NeurodataType = "neurodata_type";
    public const string NamespaceAttribute = "namespace";
    public const string ObjectId = "object_id";
    public const string NwbVersion = "nwb_version";

    public const string NwbFile = "NWBFile";
    public const string CurrentClampSeries = "CurrentClampSeries";
    public const string CurrentClampStimulusSeries = "CurrentClampStimulusSeries";
    public const string IntracellularElectrode = "IntracellularElectrode";
    public const string Device = "Device";

    public const string Data = "data";
    public const string Unit = "unit";
    public const string Conversion = "conversion";
    public const string Offset = "offset";
    public const string Resolution = "resolution";
    public const string StartingTime = "starting_time";
    public const string Rate = "rate";
    public const string Timestamps = "timestamps";
    public const string SweepNumber = "sweep_number";
    public const string StimulusDescription = "stimulus_description";
    public const string Electrode = "electrode";
    public const string CellId = "cell_id";

    /// <summary>Core series types that are not current-clamp recordings: skipped with a note, not refused.</summary>
    public static readonly IReadOnlySet<string> OtherCoreSeries = new HashSet<string>(StringComparer.Ordinal)
    {
        "TimeSeries", "VoltageClampSeries", "VoltageClampStimulusSeries", "IZeroClampSeries", "PatchClampSeries", "ElectricalSeries",
        "SpikeEventSeries", "ImageSeries", "ImageMaskSeries", "OpticalSeries", "TwoPhotonSeries", "OptogeneticSeries",
        "RoiResponseSeries", "AnnotationSeries", "IntervalSeries", "AbstractFeatureSeries", "SpatialSeries", "DecompositionSeries",
        "Units", "TimeIntervals", "ProcessingModule", "NWBDataInterface",
    };
}
