using Npgsql;

namespace IndexKeeper.Service.Configuration;

/// <summary>
/// The work queue's part of <see cref="IndexKeeperOptionsValidator"/>. The connection string is parsed by
/// Npgsql itself; no message repeats it (it may carry what should not be logged).
/// </summary>
internal static class QueueOptionsRules
{
    public static void Check(List<string> errors, QueueOptions queue)
    {
        if (queue.Connection is { } connection)
        {
            CheckConnection(errors, connection);
        }
        else if (!string.IsNullOrWhiteSpace(queue.PasswordFile))
        {
            errors.Add("Queue:PasswordFile: set without Queue:Connection; set both, or neither (one process, no queue).");
        }

        if (!string.IsNullOrWhiteSpace(queue.PasswordFile) && !File.Exists(queue.PasswordFile))
        {
            errors.Add($"Queue:PasswordFile: the file '{queue.PasswordFile}' does not exist.");
        }

        if (queue.WhenUnreachable is not ("local" or "wait"))
        {
            errors.Add($"Queue:WhenUnreachable: '{queue.WhenUnreachable}' is not allowed; use local (embed here meanwhile) or wait.");
        }

        IndexKeeperOptionsValidator.Range(errors, "Queue:LeaseSeconds", queue.LeaseSeconds, 5, 24 * 3600);
        IndexKeeperOptionsValidator.Range(errors, "Queue:PublishAhead", queue.PublishAhead, 1, 100_000);
        IndexKeeperOptionsValidator.Range(errors, "Queue:ClaimBatch", queue.ClaimBatch, 1, 1024);
        IndexKeeperOptionsValidator.Range(errors, "Queue:HeartbeatSeconds", queue.HeartbeatSeconds, 0.1, 3600);
        IndexKeeperOptionsValidator.Range(errors, "Queue:ReconnectMaxSeconds", queue.ReconnectMaxSeconds, 1, 3600);
        if (queue.HeartbeatSeconds * 3 > queue.LeaseSeconds)
        {
            errors.Add($"Queue:HeartbeatSeconds: {queue.HeartbeatSeconds} is too long for Queue:LeaseSeconds {queue.LeaseSeconds}; a worker renews its leases with its heartbeat, so keep three heartbeats inside one lease.");
        }

        if (queue.WorkerName is { } name && (name.Length is 0 or > 64 || name.Any(char.IsControl)))
        {
            errors.Add("Queue:WorkerName: use 1-64 printable characters.");
        }
    }

    private static void CheckConnection(List<string> errors, string connection)
    {
        NpgsqlConnectionStringBuilder builder;
        try
        {
            builder = new NpgsqlConnectionStringBuilder(connection);
        }
        catch (Exception ex) when (ex is ArgumentException or FormatException or KeyNotFoundException)
        {
            // Npgsql's message names the keyword, never the value.
            errors.Add($"Queue:Connection: not an Npgsql connection string ({ex.Message.TrimEnd('.')}); e.g. Host=db.example.org;Database=indexkeeper;Username=indexkeeper.");
            return;
        }

        if (string.IsNullOrWhiteSpace(builder.Host))
        {
            errors.Add("Queue:Connection: names no Host; e.g. Host=db.example.org;Database=indexkeeper;Username=indexkeeper.");
        }

        if (!string.IsNullOrEmpty(builder.Password))
        {
            // A password in a setting ends up in shell histories, unit files and process listings.
            errors.Add("Queue:Connection: holds a Password; remove it and put it in the file Queue:PasswordFile names (or in a PGPASSFILE).");
        }
    }
}
