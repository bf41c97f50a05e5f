using System.Buffers.Binary;
using System.Globalization;
using System.Security.Cryptography;
using System.Text;

namespace ExprModel.Data.Store;

/// <summary>
/// The SHA-256 checksum of a snapshot's content, stored beside it and checked on every read, in exports and on import.
/// Every stored field is hashed in a fixed order, each as a presence byte, an 8-byte big-endian length and its UTF-8
/// (or raw) bytes, so no two different snapshots share an encoding. Written as 64 lower-case hex digits.
/// </summary>
public static class SnapshotContent
{
    public static string Sha256(Snapshot s)
    {
        using var hash = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        Text(hash, s.Id);
        Text(hash, s.ParentId);
        Text(hash, s.CreatedUtc.ToString("O", CultureInfo.InvariantCulture));
        Text(hash, s.ModelJson);
        Text(hash, string.Join('\n', s.CatalogVersions));
        Text(hash, s.ProtocolJson);
        Text(hash, s.ReadoutsJson);
        Text(hash, s.Notes);
        Bytes(hash, s.Expression);
        Text(hash, s.ExpressionName);
        Text(hash, s.RecordedJson);
        return Convert.ToHexStringLower(hash.GetHashAndReset());
    }

    private static void Text(IncrementalHash hash, string? value) => Bytes(hash, value is null ? null : Encoding.UTF8.GetBytes(value));

    private static void Bytes(IncrementalHash hash, byte[]? value)
    {
        Span<byte> head = stackalloc byte[9];
        head[0] = value is null ? (byte)0 : (byte)1;
        BinaryPrimitives.WriteInt64BigEndian(head[1..], value?.LongLength ?? 0);
        hash.AppendData(head);
        if (value is not null) hash.AppendData(value);
    }
}
