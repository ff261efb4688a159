namespace ModelWatch.Store.Migrations;

/// <summary>What a migration run did: the versions it applied (empty when the schema was current) and the version now in force.</summary>
public sealed record MigrationResult(IReadOnlyList<int> Applied, int CurrentVersion);
