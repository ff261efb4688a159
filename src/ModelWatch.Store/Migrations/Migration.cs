namespace ModelWatch.Store.Migrations;

/// <summary>One embedded SQL script: <c>NNNN_name.sql</c>, applied once, in version order.</summary>
internal sealed record Migration(int Version, string Name, string Sql, string Checksum);
