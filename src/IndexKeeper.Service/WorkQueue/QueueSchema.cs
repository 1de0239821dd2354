using IndexKeeper.Service.Configuration;
using Npgsql;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// The work queue's tables in PostgreSQL, versioned (docs/work-queue.md, whose version matches
/// <see cref="Version"/>). <see cref="Ensure"/> creates them in an empty database and refuses a newer
/// version before writing anything; the coordinator and every worker call it when they connect. Only the
/// coordinator migrates an older version: a worker of this build would otherwise change the tables under
/// a coordinator of the older one, so it refuses and says to upgrade the coordinator first.
/// </summary>
internal static class QueueSchema
{
    /// <summary>The schema version this build reads and writes. Never reuse a number.</summary>
    public const int Version = 2;

    /// <summary>The PostgreSQL schema (namespace) holding the queue's tables.</summary>
    public const string Name = "indexkeeper_queue";

    // Any constant: two processes creating the schema at once take turns on this transaction-level lock.
    private const long CreationLock = 0x496B_5175_6575_6531;

    // Version 1 (internal: the migration test builds it). The numbers stored in jobs.state and jobs.failure_kind are JobState and JobFailure: never change them.
    internal const string CreateVersion1 = $"""
        CREATE SCHEMA IF NOT EXISTS {Name};
        CREATE TABLE {Name}.schema_version (
            singleton boolean PRIMARY KEY DEFAULT true CHECK (singleton),
            version integer NOT NULL);
        CREATE TABLE {Name}.jobs (
            page_key text NOT NULL,
            encoder_id text NOT NULL,
            root_name text NOT NULL,
            relative_path text NOT NULL,
            page_number integer NOT NULL,
            file_hash text NOT NULL,
            priority smallint NOT NULL,
            published_at timestamptz NOT NULL DEFAULT now(),
            state smallint NOT NULL DEFAULT 0,
            worker text,
            lease_until timestamptz,
            claims integer NOT NULL DEFAULT 0,
            result_encoder_id text,
            result bytea,
            failure_kind smallint,
            failure text,
            finished_at timestamptz,
            PRIMARY KEY (page_key, encoder_id));
        CREATE INDEX jobs_claimable ON {Name}.jobs (encoder_id, state, priority, published_at);
        CREATE TABLE {Name}.workers (
            worker text PRIMARY KEY,
            host text NOT NULL,
            encoder_id text NOT NULL,
            encoder_name text NOT NULL,
            heartbeat_seconds double precision NOT NULL,
            started_at timestamptz NOT NULL,
            heartbeat_at timestamptz NOT NULL,
            pages_done bigint NOT NULL DEFAULT 0,
            pages_failed bigint NOT NULL DEFAULT 0,
            encoder_seconds double precision NOT NULL DEFAULT 0,
            leases_taken_over bigint NOT NULL DEFAULT 0);
        INSERT INTO {Name}.schema_version (version) VALUES (1);
        """;

    // Version 2: results are float16 (VectorSetWire version 2) in a column of a new name, so a worker of an
    // older build cannot hand back float32 bytes into it: its hand-back fails and, restarted, it is told the
    // tables are newer than it reads. Results such workers left (state 2, done) wait again (state 0) to be encoded anew.
    private const string MigrateTo2 = $"""
        UPDATE {Name}.jobs SET state = 0, worker = NULL, lease_until = NULL, result_encoder_id = NULL, result = NULL, finished_at = NULL
            WHERE state = 2;
        ALTER TABLE {Name}.jobs RENAME COLUMN result TO result_float16;
        UPDATE {Name}.schema_version SET version = 2;
        """;

    /// <summary>
    /// Creates or (<paramref name="migrate"/>) migrates the tables; returns the version found before (0: none).
    /// A newer version than <see cref="Version"/>, or an older one without <paramref name="migrate"/>, is a
    /// <see cref="ConfigurationException"/> naming Queue:Connection, and nothing is written.
    /// </summary>
    /// <param name="migrate">True for the coordinator; a worker only creates tables in an empty database.</param>
    public static int Ensure(NpgsqlDataSource database, bool migrate)
    {
        ArgumentNullException.ThrowIfNull(database);
        using var connection = database.OpenConnection();
        using var transaction = connection.BeginTransaction();
        Execute(connection, transaction, $"SELECT pg_advisory_xact_lock({CreationLock})");
        var found = Found(connection, transaction);
        if (found > Version)
        {
            transaction.Rollback();
            throw new ConfigurationException([
                $"Queue:Connection: the work queue's tables in database '{connection.Database}' are of version {found}, newer than this build's {Version}; upgrade IndexKeeper on this machine (docs/work-queue.md). Nothing was written."]);
        }

        if (found > 0 && found < Version && !migrate)
        {
            transaction.Rollback();
            throw new ConfigurationException([
                $"Queue:Connection: the work queue's tables in database '{connection.Database}' are of version {found}, older than this build's {Version}; upgrade and start the coordinator (`indexkeeper run`) first, it migrates them (docs/work-queue.md). Nothing was written."]);
        }

        if (found == 0)
        {
            Execute(connection, transaction, CreateVersion1);
        }

        if (found < 2)
        {
            Execute(connection, transaction, MigrateTo2);
        }

        transaction.Commit();
        return found;
    }

    /// <summary>The version recorded in the database, 0 when the tables do not exist.</summary>
    public static int Found(NpgsqlConnection connection, NpgsqlTransaction? transaction = null)
    {
        ArgumentNullException.ThrowIfNull(connection);
        using var exists = new NpgsqlCommand($"SELECT to_regclass('{Name}.schema_version') IS NOT NULL", connection, transaction);
        if (!(bool)exists.ExecuteScalar()!)
        {
            return 0;
        }

        using var read = new NpgsqlCommand($"SELECT version FROM {Name}.schema_version", connection, transaction);
        return read.ExecuteScalar() is int version ? version : 0;
    }

    private static void Execute(NpgsqlConnection connection, NpgsqlTransaction transaction, string sql)
    {
        using var command = new NpgsqlCommand(sql, connection, transaction);
        command.ExecuteNonQuery();
    }
}
