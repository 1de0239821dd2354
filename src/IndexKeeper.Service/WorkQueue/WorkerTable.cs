using Npgsql;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>The statements on <c>workers</c>: a worker's heartbeat with its figures, and the coordinator's read of them.</summary>
internal sealed class WorkerTable(NpgsqlDataSource database)
{
    private const string Workers = QueueSchema.Name + ".workers";

    /// <summary>Records a worker's figures so far (insert at its first heartbeat, update after).</summary>
    public void Heartbeat(WorkerFigures figures, double heartbeatSeconds)
    {
        ArgumentNullException.ThrowIfNull(figures);
        using var command = database.CreateCommand($"""
            INSERT INTO {Workers} (worker, host, encoder_id, encoder_name, heartbeat_seconds, started_at, heartbeat_at, pages_done, pages_failed, encoder_seconds, leases_taken_over)
            VALUES (@worker, @host, @encoder, @name, @interval, @started, now(), @done, @failed, @seconds, @taken)
            ON CONFLICT (worker) DO UPDATE SET host = excluded.host, encoder_id = excluded.encoder_id, encoder_name = excluded.encoder_name,
                heartbeat_seconds = excluded.heartbeat_seconds, started_at = excluded.started_at, heartbeat_at = now(),
                pages_done = excluded.pages_done, pages_failed = excluded.pages_failed, encoder_seconds = excluded.encoder_seconds,
                leases_taken_over = excluded.leases_taken_over
            """);
        command.Parameters.AddWithValue("worker", figures.Worker);
        command.Parameters.AddWithValue("host", figures.Host);
        command.Parameters.AddWithValue("encoder", figures.EncoderId);
        command.Parameters.AddWithValue("name", figures.EncoderName);
        command.Parameters.AddWithValue("interval", heartbeatSeconds);
        command.Parameters.AddWithValue("started", figures.StartedUtc);
        command.Parameters.AddWithValue("done", figures.PagesDone);
        command.Parameters.AddWithValue("failed", figures.PagesFailed);
        command.Parameters.AddWithValue("seconds", figures.EncoderSeconds);
        command.Parameters.AddWithValue("taken", figures.LeasesTakenOver);
        command.ExecuteNonQuery();
    }

    /// <summary>Every worker seen in the last day, live first; live means a heartbeat within three of its own intervals.</summary>
    public IReadOnlyList<WorkerFigures> All()
    {
        using var command = database.CreateCommand($"""
            SELECT worker, host, encoder_id, encoder_name, started_at, heartbeat_at, pages_done, pages_failed, encoder_seconds, leases_taken_over,
                   heartbeat_at > now() - make_interval(secs => heartbeat_seconds * 3) AS live
            FROM {Workers} WHERE heartbeat_at > now() - interval '1 day'
            ORDER BY live DESC, worker
            """);
        var workers = new List<WorkerFigures>();
        using var reader = command.ExecuteReader();
        while (reader.Read())
        {
            workers.Add(new WorkerFigures(
                reader.GetString(0), reader.GetString(1), reader.GetString(2), reader.GetString(3),
                reader.GetDateTime(4), reader.GetDateTime(5), reader.GetInt64(6), reader.GetInt64(7), reader.GetDouble(8), reader.GetInt64(9), reader.GetBoolean(10)));
        }

        return workers;
    }
}
