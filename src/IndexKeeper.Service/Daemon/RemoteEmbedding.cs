using System.Net.Sockets;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.WorkQueue;
using Microsoft.Extensions.Logging;
using Npgsql;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// The coordinator's side of the work queue, one turn of the work loop at a time: commit what workers handed
/// back (<see cref="CommitResultsOperation"/>), take back unclaimed jobs the gate no longer allows, and publish
/// what the gate allows now (<see cref="PublishJobsOperation"/>). PostgreSQL out of reach: the turn embeds
/// locally (Queue:WhenUnreachable = local) or does nothing (wait), health says why, and the next attempt
/// comes after a doubling backoff. Only the work loop's thread calls <see cref="Turn"/>. Workers' hand-backs
/// wake the loop through <see cref="Wake"/> (LISTEN/NOTIFY), except while they are left to gather (<see cref="NextLook"/>); it
/// looks by itself now and then as well.
/// </summary>
/// <remarks>REQUIRES: called on the one writer's thread.</remarks>
internal sealed class RemoteEmbedding(
    QueueOptions options,
    NpgsqlDataSource database,
    PublishJobsOperation publish,
    CommitResultsOperation commit,
    OpenIndex index,
    IEmbedGate gate,
    DaemonState state,
    ILogger log) : IDisposable
{
    private readonly JobTable jobs = new(database);
    private readonly WorkerTable workers = new(database);
    // How long handed-back results wait in PostgreSQL for others to share their commit (fsync and catalog
    // transaction) when fewer than a full commit came back; they are durable there meanwhile.
    private static readonly TimeSpan CommitGather = TimeSpan.FromSeconds(5);

    private readonly TimeSpan figuresInterval = TimeSpan.FromSeconds(Math.Min(5, options.HeartbeatSeconds));
    private HashSet<string>? published;
    private QueueListener? results;
    private string? fault;
    private DateTime? faultSince;
    private TimeSpan backoff;
    private DateTimeOffset nextAttempt = DateTimeOffset.MinValue;
    private DateTimeOffset nextFigures = DateTimeOffset.MinValue;

    // Until when hand-backs are left to gather after a look that took none (GatherHold): their notifications do not wake
    // the loop meanwhile and its turns do not look.
    private DateTimeOffset holdUntil = DateTimeOffset.MinValue;
    private bool? lastOpen;

    // Jobs published under the daytime budget and the instant of their grant: they stay out after a window
    // closes, and one that comes back without vectors gives its page of budget back.
    private readonly Dictionary<string, DateTimeOffset> paid = new(StringComparer.Ordinal);
    private long committed;
    private long rejected;
    private long commits;

    /// <summary>True while jobs this coordinator published are not yet committed (and PostgreSQL answers).</summary>
    public bool Outstanding => fault is null && published is { Count: > 0 };

    /// <summary>Set when workers hand jobs back (a notification), for the loop to wait on; never set before the first turn.</summary>
    public WaitHandle Wake => (results ??= new QueueListener(database, QueueNotifications.ResultsChannel, _ => true)).Wake;

    /// <summary>
    /// While jobs are out: how long the loop may wait, and whether a hand-back's notification (<see cref="Wake"/>)
    /// should end the wait sooner. While hand-backs gather, until the look <see cref="GatherHold"/> planned, unheeded;
    /// otherwise heeded, with a look by itself after a while: slowly while hand-backs are heard, every second while the
    /// listening connection is down (a lost notification delays, never stalls).
    /// </summary>
    public (TimeSpan Wait, bool HeedHandBacks) NextLook(DateTimeOffset now) =>
        now < holdUntil ? (holdUntil - now, false)
        : (results is { Listening: true } ? QueueNotifications.SlowPoll : TimeSpan.FromSeconds(1), true);

    public void Dispose() => results?.Dispose();

    /// <summary>One turn; <paramref name="embedLocally"/> runs while PostgreSQL is out of reach and the setting says local. True when work was done.</summary>
    public bool Turn(Func<bool> embedLocally)
    {
        var now = state.Clock.GetUtcNow();
        if (fault is not null && now < nextAttempt)
        {
            return Meanwhile(embedLocally);
        }

        try
        {
            if (published is null)
            {
                QueueSchema.Ensure(database, migrate: true);

                // Jobs of an encoder this index no longer embeds with would wait forever for a worker of their own.
                jobs.WithdrawOthers(index.Encoder.Identity.Id);
                published = jobs.Outstanding(index.Encoder.Identity.Id);
                paid.Keys.Where(k => !published.Contains(k)).ToList().ForEach(k => paid.Remove(k));
            }

            var busy = Collect(now);
            busy |= Publish(now);
            if (fault is not null)
            {
                log.LogInformation("PostgreSQL answers again; the work queue is back in use.");
                (fault, faultSince, backoff) = (null, null, TimeSpan.Zero);
            }

            if (now >= nextFigures)
            {
                Figures();
                nextFigures = now + figuresInterval;
            }

            return busy;
        }
        catch (Exception ex) when (ex is NpgsqlException or SocketException or TimeoutException or ConfigurationException)
        {
            // The local batch first: by the time health names the fault, what this turn did is committed.
            var busy = Meanwhile(embedLocally);
            Unreachable(ex, now);
            return busy;
        }
    }

    /// <summary>Handed-back jobs committed and deleted; true when there were any.</summary>
    private bool Collect(DateTimeOffset now)
    {
        if (now < holdUntil)
        {
            return false;
        }

        // Every hand-back before this look is seen by it: only a later one's notification should wake the loop again.
        results?.Clear();
        var limit = Math.Max(1, index.Settings.EmbedBatchSize * 4);
        var look = jobs.Finished(limit, CommitGather);
        var finished = look.Taken;
        if (finished.Count == 0)
        {
            holdUntil = now + GatherHold.After(look, limit, published!.Count, CommitGather);
            return false;
        }

        var outcome = commit.Run(finished, now.UtcDateTime);
        jobs.Delete(finished.Select(f => f.Job).ToList());
        var refunds = new Dictionary<DateTimeOffset, long>();
        foreach (var job in finished)
        {
            var key = job.Job.PageKey;
            published!.Remove(key);
            if (paid.Remove(key, out var grantedAt) && !outcome.CommittedPages.Contains(key))
            {
                refunds[grantedAt] = refunds.GetValueOrDefault(grantedAt) + 1;
            }
        }

        foreach (var (grantedAt, pages) in refunds)
        {
            gate.Refund(grantedAt, pages);
        }

        foreach (var problem in outcome.Problems)
        {
            log.LogWarning("Work queue: {Problem}", problem);
        }

        committed += outcome.Committed;
        rejected += outcome.Rejected;
        if (outcome.Committed > 0)
        {
            commits++;
            state.CountEmbedded(outcome.Committed);
            state.CountRemote(outcome.Committed);
        }

        return true;
    }

    /// <summary>Takes back what the gate no longer allows and publishes what it allows now, up to Queue:PublishAhead outstanding.</summary>
    private bool Publish(DateTimeOffset now)
    {
        var encoderId = index.Encoder.Identity.Id;
        var allowance = gate.Allowance(now, index.Catalog.Counts.Due(now.UtcDateTime));
        state.Allowance = allowance;
        if (!allowance.WindowOpen && lastOpen != false)
        {
            // Out of a window (it closed, or this coordinator just connected): unclaimed jobs the budget did not
            // pay for come back, so bulk work stops on every machine; claimed ones finish.
            foreach (var key in jobs.WithdrawUnpaid(encoderId, paid.Keys))
            {
                published!.Remove(key);
            }
        }

        lastOpen = allowance.WindowOpen;
        if (allowance.MaxPages <= 0)
        {
            return false;
        }

        // Published in runs of at least a quarter of PublishAhead: each run reads the published entries again to skip them.
        var room = (int)Math.Min(options.PublishAhead - published!.Count, allowance.MaxPages);
        if (room < Math.Max(1, options.PublishAhead / 4) && room < allowance.MaxPages)
        {
            return false;
        }

        var keys = publish.Run(jobs, published, room, allowance.LowestPriority, now.UtcDateTime);
        if (keys.Count == 0)
        {
            return false;
        }

        gate.Spent(now, keys.Count);
        if (!allowance.WindowOpen)
        {
            foreach (var key in keys)
            {
                paid[key] = now;
            }
        }

        log.LogDebug("Published {Jobs} job(s).", keys.Count);
        return true;
    }

    private void Figures()
    {
        var (waiting, claimed, finished, expired) = jobs.Counts();
        state.WorkQueue = new WorkQueueFigures(null, null, waiting, claimed, finished, expired, committed, rejected, commits, workers.All());
    }

    private bool Meanwhile(Func<bool> embedLocally) => options.WhenUnreachable == "local" && embedLocally();

    private void Unreachable(Exception ex, DateTimeOffset now)
    {
        var first = fault is null;
        fault = ex.Message;
        faultSince ??= now.UtcDateTime;
        published = null;
        lastOpen = null;
        backoff = Reconnect.Next(backoff, TimeSpan.FromSeconds(options.ReconnectMaxSeconds));
        nextAttempt = now + backoff;
        var last = state.WorkQueue;
        state.WorkQueue = new WorkQueueFigures(fault, faultSince, 0, 0, 0, 0, committed, rejected, commits, last?.Workers ?? []);
        if (first)
        {
            log.LogWarning(
                "PostgreSQL is out of reach ({Message}); {Meanwhile}; trying again with backoff.",
                ex.Message,
                options.WhenUnreachable == "local" ? "embedding here meanwhile" : "embedding waits (Queue:WhenUnreachable = wait)");
        }
    }
}
