using System.Globalization;
using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Store;

/// <summary>How a <see cref="Snapshot"/> is written to and read from a row of the <c>snapshots</c> table.</summary>
internal static class SnapshotRows
{
    public const string Columns = "snapshot_id, parent_id, created_utc, model_json, catalog_versions, protocol_json, readouts_json, notes, "
        + "expression, expression_name, recorded_json, content_sha256";

    public static bool Exists(SqliteCommand cmd, string id)
    {
        cmd.Parameters.Clear();
        cmd.CommandText = "SELECT COUNT(*) FROM snapshots WHERE snapshot_id = $p";
        cmd.Parameters.AddWithValue("$p", id);
        var found = Convert.ToInt64(cmd.ExecuteScalar(), CultureInfo.InvariantCulture) > 0;
        cmd.Parameters.Clear();
        return found;
    }

    public static void Insert(SqliteCommand cmd, Snapshot snap)
    {
        cmd.Parameters.Clear();
        cmd.CommandText = $"INSERT INTO snapshots ({Columns}) "
            + "VALUES ($id, $parent, $created, $model, $versions, $protocol, $readouts, $notes, $expr, $exprName, $recorded, $sha)";
        cmd.Parameters.AddWithValue("$id", snap.Id);
        cmd.Parameters.AddWithValue("$parent", (object?)snap.ParentId ?? DBNull.Value);
        cmd.Parameters.AddWithValue("$created", snap.CreatedUtc.ToString("O", CultureInfo.InvariantCulture));
        cmd.Parameters.AddWithValue("$model", snap.ModelJson);
        cmd.Parameters.AddWithValue("$versions", string.Join('\n', snap.CatalogVersions));
        cmd.Parameters.AddWithValue("$protocol", snap.ProtocolJson);
        cmd.Parameters.AddWithValue("$readouts", snap.ReadoutsJson);
        cmd.Parameters.AddWithValue("$notes", snap.Notes);
        cmd.Parameters.AddWithValue("$expr", (object?)snap.Expression ?? DBNull.Value);
        cmd.Parameters.AddWithValue("$exprName", (object?)snap.ExpressionName ?? DBNull.Value);
        cmd.Parameters.AddWithValue("$recorded", (object?)snap.RecordedJson ?? DBNull.Value);
        cmd.Parameters.AddWithValue("$sha", snap.ContentSha256);
        cmd.ExecuteNonQuery();
        cmd.Parameters.Clear();
    }

    public static Snapshot Read(SqliteDataReader r)
    {
        var versions = r.GetString(4);
        return new Snapshot
        {
            Id = r.GetString(0),
            ParentId = r.IsDBNull(1) ? null : r.GetString(1),
            CreatedUtc = DateTimeOffset.Parse(r.GetString(2), CultureInfo.InvariantCulture, DateTimeStyles.RoundtripKind),
            ModelJson = r.GetString(3),
            CatalogVersions = versions.Length == 0 ? [] : versions.Split('\n'),
            ProtocolJson = r.GetString(5),
            ReadoutsJson = r.GetString(6),
            Notes = r.GetString(7),
            Expression = r.IsDBNull(8) ? null : (byte[])r[8],
            ExpressionName = r.IsDBNull(9) ? null : r.GetString(9),
            RecordedJson = r.IsDBNull(10) ? null : r.GetString(10),
            ContentSha256 = r.FieldCount > 11 && !r.IsDBNull(11) ? r.GetString(11) : "",
        };
    }
}
