using System.Security.Cryptography;
using System.Text;
using PureHDF;

namespace ExprModel.Core.Recordings;

/// <summary>
/// Writes current-clamp sweep families as NWB 2.x files (names in <see cref="NwbSchema"/>): per sweep a
/// CurrentClampSeries under /acquisition and its CurrentClampStimulusSeries under /stimulus/presentation, both with the
/// sweep's number and a link to the cell's IntracellularElectrode under /general/intracellular_ephys. Voltage is stored
/// as float32 millivolts (unit "volts", conversion 0.001) and current as float32 picoamperes (unit "amperes",
/// conversion 1e-12), which halves the file against float64 and keeps 7 significant digits. Object ids are derived
/// from the identifier and the object's path, so the same session gives the same bytes.
/// </summary>
public static class NwbWriter
{
    public static void Write(string path, NwbSession session)
    {
        var file = Build(session);
        var dir = Path.GetDirectoryName(Path.GetFullPath(path))!;
        Directory.CreateDirectory(dir);
        // Write beside the target and rename, so a failed write never leaves half a file under the final name.
        var temp = Path.Combine(dir, $".{Path.GetFileName(path)}.{Environment.ProcessId}.tmp");
        try
        {
            file.Write(temp);
            File.Move(temp, path, overwrite: true);
        }
        finally
        {
            if (File.Exists(temp)) File.Delete(temp);
        }
    }

    /// <summary>The file as PureHDF objects (tests alter it to make broken files).</summary>
    public static H5File Build(NwbSession session)
    {
        string Id(string objectPath) => ObjectId(session.Identifier, objectPath);
        string date = session.StartTime.ToString("yyyy-MM-dd'T'HH:mm:ssK", System.Globalization.CultureInfo.InvariantCulture);
        var acquisition = new H5Group();
        var presentation = new H5Group();
        var electrodes = new H5Group();
        var device = Typed(new H5Group { Attributes = new() { ["description"] = "current-clamp amplifier" } }, NwbSchema.Device,
            Id("/general/devices/amplifier"));
        for (int c = 0; c < session.Cells.Count; c++)
        {
            var cell = session.Cells[c];
            string electrode = $"electrode_{c}";
            string electrodePath = $"/{NwbSchema.General}/{NwbSchema.IntracellularEphys}/{electrode}";
            electrodes[electrode] = Typed(new H5Group
            {
                ["description"] = "whole-cell patch electrode",
                [NwbSchema.CellId] = cell.CellId,
                ["device"] = new H5SoftLink("/general/devices/amplifier"),
            }, NwbSchema.IntracellularElectrode, Id(electrodePath));
            foreach (var sweep in cell.Sweeps)
            {
                string name = session.Cells.Count == 1 ? $"sweep_{sweep.SweepNumber:D3}" : $"cell_{c}_sweep_{sweep.SweepNumber:D3}";
                acquisition[name] = Series(NwbSchema.CurrentClampSeries, VoltageData(sweep.VoltageMv, session), sweep, electrodePath,
                    Id($"/acquisition/{name}"));
                presentation[name] = Series(NwbSchema.CurrentClampStimulusSeries,
                    Data(Floats(sweep.FullCommandPa ?? sweep.CurrentPa), "amperes", 1e-12f, session.Compress),
                    sweep, electrodePath, Id($"/stimulus/presentation/{name}"));
            }
        }
        var file = new H5File
        {
            ["file_create_date"] = new[] { date },
            ["identifier"] = session.Identifier,
            ["session_description"] = session.Description,
            ["session_start_time"] = date,
            ["timestamps_reference_time"] = date,
            [NwbSchema.Acquisition] = acquisition,
            ["analysis"] = new H5Group(),
            ["processing"] = new H5Group(),
            [NwbSchema.Stimulus] = new H5Group { [NwbSchema.Presentation] = presentation, [NwbSchema.Templates] = new H5Group() },
            [NwbSchema.General] = new H5Group { [NwbSchema.Devices] = new H5Group { ["amplifier"] = device }, [NwbSchema.IntracellularEphys] = electrodes },
            ["specifications"] = new H5Group(),
            Attributes = new()
            {
                [NwbSchema.NamespaceAttribute] = NwbSchema.Namespace,
                [NwbSchema.NeurodataType] = NwbSchema.NwbFile,
                [NwbSchema.NwbVersion] = NwbSchema.Version,
                [NwbSchema.ObjectId] = Id("/"),
            },
        };
        return file;
    }

    private static H5Dataset VoltageData(double[] mv, NwbSession session)
    {
        if (session.VoltageResolutionMv is not { } step) return Data(Floats(mv), "volts", 1e-3f, session.Compress);
        var counts = new short[mv.Length];
        for (int i = 0; i < mv.Length; i++)
        {
            double c = Math.Round(mv[i] / step);
            if (c is < short.MinValue or > short.MaxValue) throw new ArgumentException($"{mv[i]} mV does not fit 16 bits in steps of {step} mV.");
            counts[i] = (short)c;
        }
        return Data(counts, "volts", (float)(step * 1e-3), session.Compress);
    }

    private static float[] Floats(double[] values)
    {
        var data = new float[values.Length];
        for (int i = 0; i < values.Length; i++) data[i] = (float)values[i];
        return data;
    }

    private static H5Dataset Data<T>(T[] values, string unit, float conversion, bool compress)
    {
        var attributes = new Dictionary<string, object>
        {
            [NwbSchema.Unit] = unit,
            [NwbSchema.Conversion] = conversion,
            [NwbSchema.Offset] = 0f,
            [NwbSchema.Resolution] = -1f
        };
        return compress
            ? new H5Dataset(values, chunks: [(uint)Math.Min(values.Length, 1 << 16)],
                datasetCreation: new PureHDF.VOL.Native.H5DatasetCreation { Filters = [PureHDF.Filters.DeflateFilter.Id] })
            { Attributes = attributes }
            : new H5Dataset(values) { Attributes = attributes };
    }

    private static H5Group Series(string type, H5Dataset data, RecordedSweep sweep, string electrodePath, string objectId)
    {
        return Typed(new H5Group
        {
            [NwbSchema.Data] = data,
            [NwbSchema.StartingTime] = new H5Dataset(0.0)
            {
                Attributes = new()
                {
                    [NwbSchema.Rate] = (float)sweep.SamplingRateHz,
                    [NwbSchema.Unit] = "seconds"
                }
            },
            [NwbSchema.Electrode] = new H5SoftLink(electrodePath),
            Attributes = new()
            {
                [NwbSchema.SweepNumber] = (uint)sweep.SweepNumber,
                [NwbSchema.StimulusDescription] = "step family",
                ["description"] = "no description",
                ["comments"] = "no comments",
            },
        }, type, objectId);
    }

    private static H5Group Typed(H5Group group, string type, string? objectId)
    {
        group.Attributes ??= new();
        group.Attributes[NwbSchema.NamespaceAttribute] = NwbSchema.Namespace;
        group.Attributes[NwbSchema.NeurodataType] = type;
        if (objectId is not null) group.Attributes[NwbSchema.ObjectId] = objectId;
        return group;
    }

    /// <summary>A version-4-shaped UUID from SHA-256 of identifier and path (the schema asks for a unique id; this one is reproducible).</summary>
    private static string ObjectId(string identifier, string objectPath)
    {
        var hash = SHA256.HashData(Encoding.UTF8.GetBytes(identifier + "\n" + objectPath));
        hash[6] = (byte)((hash[6] & 0x0f) | 0x40);
        hash[8] = (byte)((hash[8] & 0x3f) | 0x80);
        return new Guid(hash.AsSpan(0, 16), bigEndian: true).ToString();
    }
}
