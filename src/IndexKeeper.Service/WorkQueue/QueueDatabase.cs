using System.Net.Sockets;
using IndexKeeper.Service.Configuration;
using Npgsql;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// Opens the work queue's database from the settings: the connection string of Queue:Connection, the
/// password from Queue:PasswordFile (else Npgsql's own PGPASSFILE), and tells a setting to fix (a refused
/// login, a newer schema: exit 2) from a database that is only out of reach (retried with backoff).
/// </summary>
internal static class QueueDatabase
{
    /// <summary>A data source for <paramref name="queue"/>; REQUIRES: the settings were validated and Connection is set.</summary>
    /// <param name="readOnly">Every transaction read-only (PostgreSQL's <c>default_transaction_read_only</c>): for <c>plan</c>, which never writes.</param>
    public static NpgsqlDataSource Create(QueueOptions queue, string applicationName, bool readOnly = false)
    {
        ArgumentNullException.ThrowIfNull(queue);
        var builder = new NpgsqlConnectionStringBuilder(queue.Connection)
        {
            ApplicationName = applicationName,
        };
        if (readOnly)
        {
            builder.Options = ((builder.Options ?? string.Empty) + " -c default_transaction_read_only=on").Trim();
        }
        if (builder.Timeout == new NpgsqlConnectionStringBuilder().Timeout)
        {
            // Out of reach is found out soon, so the coordinator can embed locally meanwhile.
            builder.Timeout = 5;
        }

        if (!string.IsNullOrWhiteSpace(queue.PasswordFile))
        {
            builder.Password = ReadPassword(queue.PasswordFile);
        }

        return NpgsqlDataSource.Create(builder);
    }

    /// <summary>Connects and creates or checks the tables (<see cref="QueueSchema.Ensure"/>); a problem of the settings is a <see cref="ConfigurationException"/>.</summary>
    /// <param name="migrate">True for the coordinator: it migrates older tables; a worker refuses them (<see cref="QueueSchema.Ensure"/>).</param>
    public static void Check(NpgsqlDataSource database, bool migrate)
    {
        try
        {
            QueueSchema.Ensure(database, migrate);
        }
        catch (PostgresException ex) when (IsSettingProblem(ex))
        {
            throw AsConfiguration(ex);
        }
    }

    /// <summary>True for a failure that waiting will not mend: a refused login, a missing database or role.</summary>
    public static bool IsSettingProblem(PostgresException ex)
    {
        ArgumentNullException.ThrowIfNull(ex);

        // SQLSTATE classes 28 (invalid authorization) and 3D (invalid catalog name), and 42501 (insufficient privilege):
        // PostgreSQL documentation, Appendix A "PostgreSQL Error Codes".
        return ex.SqlState.StartsWith("28", StringComparison.Ordinal) || ex.SqlState.StartsWith("3D", StringComparison.Ordinal) || ex.SqlState == "42501";
    }

    /// <summary>The refusal as a setting problem: what PostgreSQL said, never the password.</summary>
    public static ConfigurationException AsConfiguration(PostgresException ex)
    {
        ArgumentNullException.ThrowIfNull(ex);
        return new ConfigurationException([$"Queue:Connection: PostgreSQL refused: {ex.MessageText} (SQLSTATE {ex.SqlState}); check the user and database of Queue:Connection and the password in Queue:PasswordFile or PGPASSFILE."]);
    }

    /// <summary>True for a failure that means the database is out of reach for now (network, server down or restarting).</summary>
    public static bool IsUnreachable(Exception ex) => ex switch
    {
        PostgresException postgres => !IsSettingProblem(postgres) && (postgres.SqlState.StartsWith("08", StringComparison.Ordinal) || postgres.SqlState.StartsWith("57P", StringComparison.Ordinal)),
        NpgsqlException => true,
        // Npgsql wraps its own I/O failures in NpgsqlException; a bare IOException is a file's, not the database's.
        SocketException or TimeoutException => true,
        _ => false,
    };

    private static string ReadPassword(string file)
    {
        try
        {
            return File.ReadLines(file).FirstOrDefault()?.TrimEnd('\r') ?? string.Empty;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            throw new ConfigurationException([$"Queue:PasswordFile: cannot read '{file}': {ex.Message}"]);
        }
    }
}
