using PureHDF;

namespace ExprModel.Core.Expression.AnnData;

/// <summary>
/// Where an AnnData read is (file and HDF5 path), so every error names both; <see cref="Guard{T}"/> turns the HDF5
/// library's exceptions into located format errors.
/// </summary>
internal sealed class H5Location(string file)
{
    public string File { get; } = file;
    public string Path { get; set; } = "/";

    public ExpressionFormatException Error(string what) => new($"{File}: dataset {Path}: {what}");

    /// <summary>Runs a library call, turning its exceptions into a format error at the current dataset path.</summary>
    public T Guard<T>(Func<T> read)
    {
        try { return read(); }
        catch (Exception e) when (e is not ExpressionFormatException and not OutOfMemoryException and not OperationCanceledException)
        {
            throw Error($"cannot be read ({e.GetType().Name}: {e.Message}).");
        }
    }

    public string? StringAttribute(IH5Object obj, string name)
    {
        if (!Guard(() => obj.AttributeExists(name))) return null;
        var a = Guard(() => obj.Attribute(name));
        if (!IsString(Guard(() => a.Type))) throw Error($"attribute '{name}' must be a string.");
        return Guard(() => a.Read<string>());
    }

    /// <summary>
    /// Fixed-length strings have class String; variable-length strings (what writers usually use) have class
    /// VariableLength, and reading them as strings then confirms it (a non-string sequence fails with a located error).
    /// </summary>
    public static bool IsString(IH5DataType t) => t.Class is H5DataTypeClass.String or H5DataTypeClass.VariableLength;

    public void CheckLength(IH5Dataset d, long expected)
    {
        var dims = Guard(() => d.Space.Dimensions);
        if (dims.Length != 1 || (long)dims[0] != expected)
            throw Error($"has shape [{string.Join(", ", dims)}] where [{expected}] was expected.");
    }

    /// <summary>The length of a one-dimensional dataset.</summary>
    public long Length(IH5Dataset d)
    {
        var dims = Guard(() => d.Space.Dimensions);
        if (dims.Length != 1) throw Error($"has shape [{string.Join(", ", dims)}] where a one-dimensional dataset was expected.");
        return (long)dims[0];
    }
}
