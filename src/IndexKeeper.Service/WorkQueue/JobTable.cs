using Npgsql;
using NpgsqlTypes;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// The statements on <c>jobs</c> (docs/work-queue.md): the coordinator publishes, withdraws, reads finished
/// jobs and deletes them once committed; a worker claims with <c>FOR UPDATE SKIP LOCKED</c> under a lease,
/// renews its leases and hands back. A worker's hand-back only lands while the job is still its own, so a
/// job taken over after a lease expired has one result.
/// </summary>
internal sealed class JobTable(NpgsqlDataSource database)
{
    private const string Jobs = QueueSchema.Name + ".jobs";

    // The handed-back results of one Finished call, end to end, kept from call to call: each result (≈ 100-250 KB) in
    // an array of its own went to the large-object heap, a page at a time, and brought gen2 collections of the whole
    // daemon's heap with it (docs/benchmarks.md, workqueue run 9). Grows to the largest batch read, never shrinks.
    private byte[] results = [];

    /// <summary>Publishes jobs not already there (a page key under an encoder is one job); returns how many were new.</summary>
    public int Publish(IReadOnlyList<PageJob> jobs)
    {
        ArgumentNullException.ThrowIfNull(jobs);
        if (jobs.Count == 0)
        {
            return 0;
        }

        using var command = database.CreateCommand(Notifying($"""
            INSERT INTO {Jobs} (page_key, encoder_id, root_name, relative_path, page_number, file_hash, priority)
            SELECT * FROM unnest(@keys, @encoders, @roots, @paths, @pages, @hashes, @priorities)
            ON CONFLICT (page_key, encoder_id) DO NOTHING
            RETURNING encoder_id
            """, QueueNotifications.JobsChannel));
        command.Parameters.AddWithValue("keys", jobs.Select(j => j.PageKey).ToArray());
        command.Parameters.AddWithValue("encoders", jobs.Select(j => j.EncoderId).ToArray());
        command.Parameters.AddWithValue("roots", jobs.Select(j => j.RootName).ToArray());
        command.Parameters.AddWithValue("paths", jobs.Select(j => j.RelativePath).ToArray());
        command.Parameters.AddWithValue("pages", jobs.Select(j => j.PageNumber).ToArray());
        command.Parameters.AddWithValue("hashes", jobs.Select(j => j.FileHash).ToArray());
        command.Parameters.AddWithValue("priorities", NpgsqlDbType.Array | NpgsqlDbType.Smallint, jobs.Select(j => (short)j.Priority).ToArray());
        return Changed(command);
    }

    /// <summary>Page keys with a job under <paramref name="encoderId"/>, whatever its state (what the coordinator need not publish again).</summary>
    public HashSet<string> Outstanding(string encoderId)
    {
        using var command = database.CreateCommand($"SELECT page_key FROM {Jobs} WHERE encoder_id = @encoder");
        command.Parameters.AddWithValue("encoder", encoderId);
        var keys = new HashSet<string>(StringComparer.Ordinal);
        using var reader = command.ExecuteReader();
        while (reader.Read())
        {
            keys.Add(reader.GetString(0));
        }

        return keys;
    }

    /// <summary>
    /// Takes back the unclaimed jobs of <paramref name="encoderId"/> but those in <paramref name="paidFor"/> (published
    /// under the daytime budget): out of a window, bulk work stops on every machine. Returns their page keys.
    /// </summary>
    public IReadOnlyList<string> WithdrawUnpaid(string encoderId, IReadOnlyCollection<string> paidFor)
    {
        ArgumentNullException.ThrowIfNull(paidFor);
        using var command = database.CreateCommand($"DELETE FROM {Jobs} WHERE encoder_id = @encoder AND state = {(int)JobState.Waiting} AND NOT (page_key = ANY(@paid)) RETURNING page_key");
        command.Parameters.AddWithValue("encoder", encoderId);
        command.Parameters.AddWithValue("paid", paidFor.ToArray());
        return Keys(command);
    }

    /// <summary>Takes back the unclaimed jobs of every encoder but <paramref name="activeEncoderId"/> (published before an encoder change); returns how many.</summary>
    public int WithdrawOthers(string activeEncoderId)
    {
        using var command = database.CreateCommand($"DELETE FROM {Jobs} WHERE encoder_id <> @encoder AND state = {(int)JobState.Waiting}");
        command.Parameters.AddWithValue("encoder", activeEncoderId);
        return command.ExecuteNonQuery();
    }

    /// <summary>
    /// Up to <paramref name="limit"/> jobs handed back (done or failed), oldest first; their result bytes lie in a buffer
    /// this table reuses, valid until its next call of this method. With <paramref name="gather"/>,
    /// none until there are <paramref name="limit"/> of them, or the oldest has waited that long, or no job is
    /// waiting or claimed (nothing more will come): so one commit (one fsync, one catalog transaction) takes
    /// several workers' hand-backs. Decided in the same round trip, on the database's clock, which also counts
    /// what is back and how long the oldest has waited (for <see cref="GatherHold"/>).
    /// </summary>
    public FinishedLook Finished(int limit, TimeSpan? gather = null)
    {
        using var batch = database.CreateBatch();
        batch.BatchCommands.Add(new NpgsqlBatchCommand($"""
            SELECT count(*), coalesce(extract(epoch FROM now() - min(finished_at)), 0)::float8
            FROM {Jobs} WHERE state IN ({(int)JobState.Done}, {(int)JobState.Failed})
            """));
        var rows = new NpgsqlBatchCommand($"""
            WITH back AS (SELECT count(*) AS n, min(finished_at) AS oldest FROM {Jobs} WHERE state IN ({(int)JobState.Done}, {(int)JobState.Failed}))
            SELECT page_key, encoder_id, root_name, relative_path, page_number, file_hash, priority,
                   state, worker, result_encoder_id, result_float16, failure_kind, failure
            FROM {Jobs}, back WHERE state IN ({(int)JobState.Done}, {(int)JobState.Failed})
              AND (@gather IS NULL OR back.n >= @limit OR back.oldest <= now() - @gather
                   OR NOT EXISTS (SELECT 1 FROM {Jobs} WHERE state IN ({(int)JobState.Waiting}, {(int)JobState.Claimed})))
            ORDER BY finished_at LIMIT @limit
            """);
        rows.Parameters.AddWithValue("limit", limit);
        rows.Parameters.Add(new NpgsqlParameter<TimeSpan?>("gather", NpgsqlDbType.Interval) { TypedValue = gather });
        batch.BatchCommands.Add(rows);
        var finished = new List<FinishedJob>();
        var buffer = results;
        var used = 0;

        // Sequential access: each result (hundreds of KB) is read from the socket straight into the reused buffer, not
        // first buffered whole in the connection's row buffer and copied (Npgsql's documentation, "Reading large values").
        using var reader = batch.ExecuteReader(System.Data.CommandBehavior.SequentialAccess);
        reader.Read();
        var (back, oldest) = (reader.GetInt64(0), TimeSpan.FromSeconds(Math.Max(0, reader.GetDouble(1))));
        reader.NextResult();
        while (reader.Read())
        {
            var job = ReadJob(reader);
            var state = (JobState)reader.GetInt16(7);
            var worker = reader.IsDBNull(8) ? null : reader.GetString(8);
            var resultEncoder = reader.IsDBNull(9) ? null : reader.GetString(9);
            ReadOnlyMemory<byte>? result = null;
            if (!reader.IsDBNull(10))
            {
                // A null buffer asks for the value's length (ADO.NET's GetBytes contract).
                var length = checked((int)reader.GetBytes(10, 0, null, 0, 0));
                if (used + length > buffer.Length)
                {
                    // Results already read keep the old array alive until the caller is done with them.
                    buffer = new byte[Math.Max(used + length, buffer.Length * 2)];
                    used = 0;
                }

                var read = 0L;
                while (read < length)
                {
                    read += reader.GetBytes(10, read, buffer, used + (int)read, length - (int)read);
                }

                result = buffer.AsMemory(used, length);
                used += length;
            }

            finished.Add(new FinishedJob(
                job,
                state,
                worker,
                resultEncoder,
                result,
                reader.IsDBNull(11) ? null : (JobFailure)reader.GetInt16(11),
                reader.IsDBNull(12) ? null : reader.GetString(12)));
        }

        results = buffer;
        return new FinishedLook(finished, back, oldest);
    }

    /// <summary>Deletes jobs the coordinator has dealt with (committed, or decided on): the table does not grow.</summary>
    public void Delete(IReadOnlyList<PageJob> jobs)
    {
        ArgumentNullException.ThrowIfNull(jobs);
        if (jobs.Count == 0)
        {
            return;
        }

        using var command = database.CreateCommand($"DELETE FROM {Jobs} j USING unnest(@keys, @encoders) AS d(page_key, encoder_id) WHERE j.page_key = d.page_key AND j.encoder_id = d.encoder_id");
        command.Parameters.AddWithValue("keys", jobs.Select(j => j.PageKey).ToArray());
        command.Parameters.AddWithValue("encoders", jobs.Select(j => j.EncoderId).ToArray());
        command.ExecuteNonQuery();
    }

    /// <summary>Jobs by state, and how many claimed ones have an expired lease (claimable again).</summary>
    public (long Waiting, long Claimed, long Finished, long Expired) Counts()
    {
        using var command = database.CreateCommand($"""
            SELECT count(*) FILTER (WHERE state = {(int)JobState.Waiting}),
                   count(*) FILTER (WHERE state = {(int)JobState.Claimed}),
                   count(*) FILTER (WHERE state IN ({(int)JobState.Done}, {(int)JobState.Failed})),
                   count(*) FILTER (WHERE state = {(int)JobState.Claimed} AND lease_until < now())
            FROM {Jobs}
            """);
        using var reader = command.ExecuteReader();
        reader.Read();
        return (reader.GetInt64(0), reader.GetInt64(1), reader.GetInt64(2), reader.GetInt64(3));
    }

    /// <summary>
    /// Claims up to <paramref name="count"/> jobs of <paramref name="encoderId"/> for <paramref name="worker"/>:
    /// waiting ones, or claimed ones whose lease has expired, highest priority first. Rows another claim holds
    /// are skipped, not waited for. Within one publication, pages of one document come together, so a worker
    /// reads the document once for them (<see cref="JobPageReader"/>); and documents in which another worker
    /// holds live claims come last, so two workers do not split a document and both read it.
    /// </summary>
    public IReadOnlyList<ClaimedJob> Claim(string worker, string encoderId, int count, TimeSpan lease)
    {
        using var command = database.CreateCommand($"""
            WITH others AS (
                SELECT DISTINCT root_name, relative_path FROM {Jobs}
                WHERE encoder_id = @encoder AND state = {(int)JobState.Claimed} AND worker <> @worker AND lease_until >= now()),
            picked AS (
                SELECT c.page_key, c.encoder_id, c.state AS old_state FROM {Jobs} c
                WHERE c.encoder_id = @encoder
                  AND (c.state = {(int)JobState.Waiting} OR (c.state = {(int)JobState.Claimed} AND c.lease_until < now()))
                ORDER BY c.priority, c.published_at,
                         EXISTS (SELECT 1 FROM others o WHERE o.root_name = c.root_name AND o.relative_path = c.relative_path),
                         c.root_name, c.relative_path, c.page_number
                LIMIT @count
                FOR UPDATE OF c SKIP LOCKED)
            UPDATE {Jobs} j SET state = {(int)JobState.Claimed}, worker = @worker, lease_until = now() + @lease, claims = j.claims + 1
            FROM picked p WHERE j.page_key = p.page_key AND j.encoder_id = p.encoder_id
            RETURNING j.page_key, j.encoder_id, j.root_name, j.relative_path, j.page_number, j.file_hash, j.priority, p.old_state
            """);
        command.Parameters.AddWithValue("encoder", encoderId);
        command.Parameters.AddWithValue("count", count);
        command.Parameters.AddWithValue("worker", worker);
        command.Parameters.AddWithValue("lease", lease);
        var claimed = new List<ClaimedJob>();
        using var reader = command.ExecuteReader();
        while (reader.Read())
        {
            claimed.Add(new ClaimedJob(ReadJob(reader), reader.GetInt16(7) == (short)JobState.Claimed));
        }

        return claimed;
    }

    /// <summary>Extends the leases <paramref name="worker"/> holds (with its heartbeat).</summary>
    public void Renew(string worker, TimeSpan lease)
    {
        using var command = database.CreateCommand($"UPDATE {Jobs} SET lease_until = now() + @lease WHERE worker = @worker AND state = {(int)JobState.Claimed}");
        command.Parameters.AddWithValue("worker", worker);
        command.Parameters.AddWithValue("lease", lease);
        command.ExecuteNonQuery();
    }

    /// <summary>Makes the claims <paramref name="worker"/> still holds claimable at once (a worker that stops); returns how many.</summary>
    public int Release(string worker)
    {
        using var command = database.CreateCommand(Notifying(
            $"UPDATE {Jobs} SET state = {(int)JobState.Waiting}, worker = NULL, lease_until = NULL WHERE worker = @worker AND state = {(int)JobState.Claimed} RETURNING encoder_id",
            QueueNotifications.JobsChannel));
        command.Parameters.AddWithValue("worker", worker);
        return Changed(command);
    }

    /// <summary>
    /// Hands back the vector sets of one encoder batch in one statement; returns how many landed. A job that is
    /// no longer this worker's (its lease expired and another took it) is left alone.
    /// </summary>
    public int Finish(string worker, IReadOnlyList<(PageJob Job, byte[] Result)> results, string resultEncoderId)
    {
        ArgumentNullException.ThrowIfNull(results);
        if (results.Count == 0)
        {
            return 0;
        }

        using var command = database.CreateCommand(Notifying($"""
            UPDATE {Jobs} j SET state = {(int)JobState.Done}, result_encoder_id = @result_encoder, result_float16 = r.result, finished_at = now(), lease_until = NULL
            FROM unnest(@keys, @encoders, @results) AS r(page_key, encoder_id, result)
            WHERE j.page_key = r.page_key AND j.encoder_id = r.encoder_id AND j.worker = @worker AND j.state = {(int)JobState.Claimed}
            RETURNING j.encoder_id
            """, QueueNotifications.ResultsChannel));
        command.Parameters.AddWithValue("result_encoder", resultEncoderId);
        command.Parameters.AddWithValue("keys", results.Select(r => r.Job.PageKey).ToArray());
        command.Parameters.AddWithValue("encoders", results.Select(r => r.Job.EncoderId).ToArray());
        command.Parameters.AddWithValue("results", NpgsqlDbType.Array | NpgsqlDbType.Bytea, results.Select(r => r.Result).ToArray());
        command.Parameters.AddWithValue("worker", worker);
        return Changed(command);
    }

    /// <summary>Gives a job back without vectors; false when it is no longer this worker's.</summary>
    public bool Fail(string worker, PageJob job, JobFailure failure, string reason)
    {
        ArgumentNullException.ThrowIfNull(job);
        using var command = database.CreateCommand(Notifying($"""
            UPDATE {Jobs} SET state = {(int)JobState.Failed}, failure_kind = @kind, failure = @reason, finished_at = now(), lease_until = NULL
            WHERE page_key = @key AND encoder_id = @encoder AND worker = @worker AND state = {(int)JobState.Claimed}
            RETURNING encoder_id
            """, QueueNotifications.ResultsChannel));
        command.Parameters.AddWithValue("kind", (short)failure);
        command.Parameters.AddWithValue("reason", reason);
        return Mine(command, worker, job);
    }

    private static bool Mine(NpgsqlCommand command, string worker, PageJob job)
    {
        command.Parameters.AddWithValue("key", job.PageKey);
        command.Parameters.AddWithValue("encoder", job.EncoderId);
        command.Parameters.AddWithValue("worker", worker);
        return Changed(command) == 1;
    }

    /// <summary>
    /// <paramref name="statement"/> (ending in <c>RETURNING encoder_id</c>) with one notification on <paramref name="channel"/> for each
    /// encoder id among the rows it changed, none when it changed none. NOTIFY is delivered at commit: a listener
    /// woken by it sees the rows.
    /// </summary>
    private static string Notifying(string statement, string channel) => $"""
        WITH changed AS ({statement})
        SELECT count(*), pg_notify('{channel}', encoder_id) FROM changed GROUP BY encoder_id
        """;

    /// <summary>The rows a <see cref="Notifying"/> statement changed.</summary>
    private static int Changed(NpgsqlCommand command)
    {
        var rows = 0L;
        using var reader = command.ExecuteReader();
        while (reader.Read())
        {
            rows += reader.GetInt64(0);
        }

        return (int)rows;
    }

    private static PageJob ReadJob(NpgsqlDataReader reader) => new(
        reader.GetString(0), reader.GetString(1), reader.GetString(2), reader.GetString(3), reader.GetInt32(4), reader.GetString(5), reader.GetInt16(6));

    private static List<string> Keys(NpgsqlCommand command)
    {
        var keys = new List<string>();
        using var reader = command.ExecuteReader();
        while (reader.Read())
        {
            keys.Add(reader.GetString(0));
        }

        return keys;
    }
}
