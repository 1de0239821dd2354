using IndexKeeper.Service.Configuration;
using Npgsql;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// The work queue's tables in PostgreSQL, versioned (docs/work-queue.md, whose version matches
/// <see cref="Version"/>). <see cref="Ensure"/> creates them in an empty database, migrates an older
/// version and refuses a newer one before writing anything; the coordinator and every worker call it
/// when they connect.
/// </summary>
internal static class QueueSchema
{
    /// <summary>The schema version this build reads and writes. Never reuse a number.</summary>
    public const int Version = 1;

    /// <summary>The PostgreSQL schema (namespace) holding the queue's tables.</summary>
    public const string Name = "indexkeeper_queue";

    // Any constant: two processes creating the schema at once take turns on this transaction-level lock.
    private const long CreationLock = 0x496B_5175_6575_6531;

    // Version 1. The numbers stored in jobs.state and jobs.failure_kind are JobState and JobFailure: never change them.
    private const string CreateVersion1 = $"""
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

    /// <summary>
    /// Creates or migrates the tables; returns the version found before (0: none). A newer version than
    /// <see cref="Version"/> is a <see cref="ConfigurationException"/> naming Queue:Connection, and nothing is written.
    /// </summary>
    public static int Ensure(NpgsqlDataSource database)
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

        if (found == 0)
        {
            Execute(connection, transaction, CreateVersion1);
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
