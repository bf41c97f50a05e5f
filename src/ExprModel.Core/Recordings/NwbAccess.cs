using System.Globalization;
using PureHDF;
using PureHDF.VOL.Native;

namespace ExprModel.Core.Recordings;

/// <summary>
/// Guarded access to the HDF5 objects of an NWB file: every failure becomes a <see cref="RecordingFormatException"/>
/// naming the file and the dataset path, and sizes are checked before any data is read.
/// </summary>
internal sealed class NwbAccess(string file)
{
    /// <summary>Largest sweep read (samples): 200 s at 100 kHz. A dataset claiming more is refused before it is read.</summary>
    public const long MaxSamples = 20_000_000;

    /// <summary>HDF5 file signature (HDF5 file format specification, superblock).</summary>
    private static ReadOnlySpan<byte> Signature => [0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a];

    public string File { get; } = file;

    public RecordingFormatException Error(string path, string what) => new($"{File}: dataset {path}: {what}");

    public static NativeFile Open(string path)
    {
        string file = System.IO.Path.GetFileName(path);
        if (!System.IO.File.Exists(path)) throw new RecordingFormatException($"{file}: file not found ({path}).");
        if (new FileInfo(path).Length == 0) throw new RecordingFormatException($"{file}: byte 0: the file is empty.");
        using (var fs = System.IO.File.OpenRead(path))
        {
            Span<byte> head = stackalloc byte[8];
            if (fs.ReadAtLeast(head, 8, throwOnEndOfStream: false) < 8 || !head.SequenceEqual(Signature))
                throw new RecordingFormatException($"{file}: byte 0: not an HDF5 file (no HDF5 signature), so not an NWB file.");
        }
        try { return H5File.OpenRead(path); }
        catch (Exception e) when (e is not OutOfMemoryException)
        {
            throw new RecordingFormatException($"{file}: dataset /: cannot open as HDF5 ({e.Message}).");
        }
    }

    /// <summary>Runs a library call, turning its exceptions into a format error at <paramref name="path"/>.</summary>
    public T Guard<T>(string path, Func<T> read)
    {
        try { return read(); }
        catch (Exception e) when (e is not RecordingFormatException and not OutOfMemoryException)
        {
            throw Error(path, $"cannot be read ({e.GetType().Name}: {e.Message}).");
        }
    }

    public IH5Object? Child(IH5Group group, string name, string path) =>
        Guard(path, () => group.LinkExists(name)) ? Guard(path, () => group.Get(name)) : null;

    public string? StringAttribute(IH5Object obj, string name, string path)
    {
        if (!Guard(path, () => obj.AttributeExists(name))) return null;
        var a = Guard(path, () => obj.Attribute(name));
        if (Guard(path, () => a.Type).Class is not (H5DataTypeClass.String or H5DataTypeClass.VariableLength))
            throw Error(path, $"attribute '{name}' must be text.");
        return Guard(path, () => a.Read<string>());
    }

    /// <summary>
    /// A numeric scalar attribute. A float32 value is taken at its shortest decimal form (the schema stores conversion and
    /// rate as float32: 0.001f is read as 0.001, not 0.0010000000474974513).
    /// </summary>
    public double? NumberAttribute(IH5Object obj, string name, string path)
    {
        if (!Guard(path, () => obj.AttributeExists(name))) return null;
        var a = Guard(path, () => obj.Attribute(name));
        var t = Guard(path, () => a.Type);
        return t.Class switch
        {
            H5DataTypeClass.FloatingPoint when t.Size == 4 =>
                double.Parse(Guard(path, () => a.Read<float>()).ToString("R", CultureInfo.InvariantCulture), CultureInfo.InvariantCulture),
            H5DataTypeClass.FloatingPoint => Guard(path, () => a.Read<double>()),
            H5DataTypeClass.FixedPoint => (t.Size, t.FixedPoint.IsSigned) switch
            {
                (1, true) => Guard(path, () => a.Read<sbyte>()),
                (1, false) => Guard(path, () => a.Read<byte>()),
                (2, true) => Guard(path, () => a.Read<short>()),
                (2, false) => Guard(path, () => a.Read<ushort>()),
                (4, true) => Guard(path, () => a.Read<int>()),
                (4, false) => Guard(path, () => a.Read<uint>()),
                (8, true) => Guard(path, () => a.Read<long>()),
                _ => Guard(path, () => a.Read<ulong>()),
            },
            _ => throw Error(path, $"attribute '{name}' holds {t.Class} values, not a number."),
        };
    }

    /// <summary>
    /// Reads a one-dimensional numeric dataset as doubles, refusing one that claims more than <see cref="MaxSamples"/>
    /// before reading it, and any NaN or infinite value.
    /// </summary>
    public double[] Samples(IH5Dataset d, string path)
    {
        var dims = Guard(path, () => d.Space.Dimensions);
        if (dims.Length != 1) throw Error(path, $"has shape [{string.Join(", ", dims)}]; a sweep is one-dimensional.");
        var t = Guard(path, () => d.Type);
        if ((long)dims[0] > MaxSamples)
            throw Error(path, $"claims {dims[0]:N0} samples ({(double)dims[0] * t.Size / 1e9:0.#} GB); sweeps longer than {MaxSamples:N0} samples (200 s at " +
                "100 kHz) are refused before reading.");
        if (dims[0] == 0) throw Error(path, "is empty (no samples).");
        double[] values = t.Class switch
        {
            H5DataTypeClass.FloatingPoint when t.Size == 4 => Widen(Guard(path, () => d.Read<float[]>())),
            H5DataTypeClass.FloatingPoint when t.Size == 8 => Guard(path, () => d.Read<double[]>()),
            H5DataTypeClass.FixedPoint when t.Size == 2 && t.FixedPoint.IsSigned => Guard(path, () => d.Read<short[]>()).Select(v => (double)v).ToArray(),
            H5DataTypeClass.FixedPoint when t.Size == 4 && t.FixedPoint.IsSigned => Guard(path, () => d.Read<int[]>()).Select(v => (double)v).ToArray(),
            _ => throw Error(path, $"holds {t.Class} values of {t.Size} bytes; sweeps are read as float32, float64, int16 or int32."),
        };
        if ((ulong)values.Length != dims[0]) throw Error(path, $"truncated: {values.Length:N0} of {dims[0]:N0} samples could be read.");
        for (int i = 0; i < values.Length; i++)
        {
            if (double.IsFinite(values[i])) continue;
            int end = i;
            while (end + 1 < values.Length && !double.IsFinite(values[end + 1])) end++;
            string what = double.IsNaN(values[i]) ? "NaN" : "infinite";
            throw Error(path, end > i ? $"samples {i:N0} to {end:N0} are {what} (a run of {end - i + 1:N0})." : $"sample {i:N0} is {what}.");
        }
        return values;
    }

    private static double[] Widen(float[] raw)
    {
        var v = new double[raw.Length];
        for (int i = 0; i < raw.Length; i++) v[i] = raw[i];
        return v;
    }
}
