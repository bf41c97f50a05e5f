using System.Numerics;
using PureHDF;
using PureHDF.Selections;

namespace ExprModel.Core.Expression.AnnData;

/// <summary>Reads numbers of any HDF5 integer or float type as doubles, whole or as a hyperslab, checking each against what expression data may hold.</summary>
internal static class H5Numbers
{
    /// <param name="first">Position of the first element read, for error messages (element or row numbers).</param>
    /// <param name="rowLength">For a dense block: elements per row, so errors name row and column.</param>
    public static double[] Read(IH5Dataset d, Selection? selection, ulong count, H5Location at, bool allowNaN, bool allowNegative = false,
        long first = 0, int rowLength = 0, ReadMeter? meter = null)
    {
        var type = at.Guard(() => d.Type);
        double[] values = type.Class switch
        {
            H5DataTypeClass.FloatingPoint when type.Size == 4 => Convert<float>(d, selection, count, at),
            H5DataTypeClass.FloatingPoint when type.Size == 8 => Convert<double>(d, selection, count, at),
            H5DataTypeClass.FixedPoint => (type.Size, type.FixedPoint.IsSigned) switch
            {
                (1, true) => Convert<sbyte>(d, selection, count, at),
                (1, false) => Convert<byte>(d, selection, count, at),
                (2, true) => Convert<short>(d, selection, count, at),
                (2, false) => Convert<ushort>(d, selection, count, at),
                (4, true) => Convert<int>(d, selection, count, at),
                (4, false) => Convert<uint>(d, selection, count, at),
                (8, true) => Convert<long>(d, selection, count, at),
                (8, false) => Convert<ulong>(d, selection, count, at),
                _ => throw at.Error($"integer size {type.Size} bytes is not read."),
            },
            _ => throw at.Error($"holds {type.Class} values, not numbers."),
        };
        meter?.AddValues(values.Length);
        for (long i = 0; i < values.Length; i++)
        {
            double v = values[i];
            string? problem = double.IsNaN(v) ? (allowNaN ? null : "NaN")
                : double.IsInfinity(v) ? "an infinite value"
                : v < 0 && !allowNegative && !allowNaN ? $"negative value {v}" : null;
            if (problem is not null)
            {
                string where = rowLength > 0 ? $"row {first + i / rowLength}, column {i % rowLength}" : $"element {first + i}";
                throw at.Error($"{where}: {problem} (expression levels are finite and >= 0).");
            }
        }
        return values;
    }

    /// <summary>Elements <paramref name="start"/> .. start+count-1 of a one-dimensional dataset.</summary>
    public static double[] Slice(IH5Dataset d, long start, long count, H5Location at, ReadMeter? meter = null) =>
        Read(d, new HyperslabSelection((ulong)start, (ulong)count), (ulong)count, at, allowNaN: false, first: start, meter: meter);

    private static double[] Convert<T>(IH5Dataset d, Selection? selection, ulong count, H5Location at) where T : unmanaged, INumberBase<T>
    {
        var raw = at.Guard(() => selection is null ? d.Read<T[]>() : d.Read<T[]>(fileSelection: selection, memoryDims: [count]));
        var result = new double[raw.Length];
        for (int i = 0; i < raw.Length; i++) result[i] = double.CreateTruncating(raw[i]);
        return result;
    }
}
