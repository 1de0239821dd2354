using System.Diagnostics;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Isolation;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Faults;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Hosting;
using Microsoft.Extensions.Logging;
using Npgsql;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// <c>indexkeeper worker</c>: claims the jobs of its own encoder id, reads and checks each page
/// (<see cref="JobPageReader"/>), encodes, and hands the vector sets back; it never opens an index. Its
/// heartbeat records its figures and renews its leases. PostgreSQL out of reach: it waits and reconnects
/// with a doubling backoff. A stop request gives its unfinished claims back.
/// </summary>
public sealed class RemoteWorker : IDisposable
{
    private readonly QueueOptions queue;
    private readonly NpgsqlDataSource database;
    private readonly JobTable jobs;
    private readonly WorkerTable workers;
    private readonly IPageEncoder encoder;
    private readonly IIsolatedDocumentReader reader;
    private readonly JobPageReader pages;
    private readonly ILogger log;
    private readonly TimeSpan lease;
    private readonly Lock figuresGate = new();
    private WorkerStages stages = new();
    private WorkerFigures figures;

    public RemoteWorker(IndexKeeperOptions options, ILogger log)
    {
        ArgumentNullException.ThrowIfNull(options);
        queue = options.Queue;
        if (string.IsNullOrWhiteSpace(queue.Connection))
        {
            throw new ConfigurationException(["Queue:Connection: a worker takes its jobs from PostgreSQL; set the connection string of the coordinator's work queue."]);
        }

        this.log = log;
        lease = TimeSpan.FromSeconds(queue.LeaseSeconds);
        var settings = IndexSettings.From(options);
        database = QueueDatabase.Create(queue, "indexkeeper-worker");
        jobs = new JobTable(database);
        workers = new WorkerTable(database);
        encoder = EncoderFactory.Create(options.Encoder);
        reader = IsolatedReaderFactory.Create(settings.Reader);
        pages = new JobPageReader(settings.RootPaths, FileHasher.Create(), reader, settings.Scan.Limits);
        var name = queue.WorkerName ?? $"{Environment.MachineName}-{Environment.ProcessId}";
        figures = new WorkerFigures(name, Environment.MachineName, encoder.Identity.Id, encoder.Identity.Name, DateTime.UtcNow, DateTime.UtcNow, 0, 0, 0, 0, Live: true);
    }

    public string EncoderId => encoder.Identity.Id;

    /// <summary>Works until <paramref name="stopping"/>; a setting PostgreSQL refuses (login, newer schema) throws <see cref="ConfigurationException"/> before any job is claimed.</summary>
    /// <param name="untilIdle">Return at the first claim that finds no job (a drain, or a test).</param>
    public void Run(bool untilIdle, CancellationToken stopping)
    {
        QueueDatabase.Check(database, migrate: false);
        stages = new WorkerStages();
        log.LogInformation("Worker {Worker} takes jobs of encoder {Encoder} ({Name}).", figures.Worker, encoder.Identity.Id[..12], encoder.Identity.Name);
        using var heartbeat = new Timer(_ => Beat(), null, TimeSpan.Zero, TimeSpan.FromSeconds(queue.HeartbeatSeconds));

        // Woken when jobs of its encoder are published or given back; it still looks by itself, slowly while it listens.
        using var published = new QueueListener(database, QueueNotifications.JobsChannel, payload => payload == encoder.Identity.Id);
        var backoff = TimeSpan.Zero;
        var quickPoll = TimeSpan.FromSeconds(Math.Min(1, queue.HeartbeatSeconds));
        var interrupted = false;
        while (!stopping.IsCancellationRequested)
        {
            try
            {
                if (interrupted)
                {
                    // The turn PostgreSQL's loss broke left its claims behind, and the heartbeat would renew
                    // their leases for ever: give them back before claiming again (no turn runs meanwhile).
                    var released = jobs.Release(figures.Worker);
                    interrupted = false;
                    log.LogInformation("PostgreSQL is back; {Jobs} claim(s) of the interrupted turn given back.", released);
                }

                var worked = Turn(stopping);
                backoff = TimeSpan.Zero;
                if (!worked)
                {
                    if (untilIdle)
                    {
                        break;
                    }

                    WorkerStages.Time(stages.Waiting, () => WaitHandle.WaitAny([stopping.WaitHandle, published.Wake], published.Listening ? QueueNotifications.SlowPoll : quickPoll));
                }
            }
            catch (Exception ex) when (QueueDatabase.IsUnreachable(ex) && !stopping.IsCancellationRequested)
            {
                interrupted = true;
                backoff = Reconnect.Next(backoff, TimeSpan.FromSeconds(queue.ReconnectMaxSeconds));
                log.LogWarning("PostgreSQL is out of reach ({Message}); trying again in {Seconds:0} s.", ex.Message, backoff.TotalSeconds);
                stopping.WaitHandle.WaitOne(backoff);
            }
            catch (OperationCanceledException) when (stopping.IsCancellationRequested)
            {
            }
        }

        GiveBack();
    }

    /// <summary>One claim of up to Queue:ClaimBatch jobs, read, encoded and handed back; false when there was none.</summary>
    private bool Turn(CancellationToken stopping)
    {
        var claimed = WorkerStages.Time(stages.Claiming, () => jobs.Claim(figures.Worker, encoder.Identity.Id, queue.ClaimBatch, lease));
        if (claimed.Count == 0)
        {
            return false;
        }

        FaultInjection.Reach(FaultPoints.WorkerClaimAfter);
        var taken = claimed.Count(c => c.TakenOver);
        if (taken > 0)
        {
            log.LogInformation("Took over {Jobs} job(s) whose lease had expired.", taken);
        }

        var batch = new List<(PageJob Job, PageToEncode Page)>();
        var failed = 0;
        var read = pages.Read(claimed.Select(c => c.Job).ToList(), stopping);
        for (var i = 0; i < claimed.Count; i++)
        {
            var (job, (page, failure, reason)) = (claimed[i].Job, read[i]);
            if (page is null)
            {
                log.LogWarning("Job {Key} goes back: {Reason}", job.PageKey[..12], reason);
                WorkerStages.Time(stages.HandingBack, () => jobs.Fail(figures.Worker, job, failure, reason));
                failed++;
                continue;
            }

            batch.Add((job, page));
        }

        var (done, seconds, encodeFailed) = Encode(batch, stopping);
        Count(done, failed + encodeFailed, seconds, taken);
        return true;
    }

    /// <summary>Encodes the batch and hands back each vector set; on an encoder failure tries the pages one by one.</summary>
    private (int Done, double Seconds, int Failed) Encode(List<(PageJob Job, PageToEncode Page)> batch, CancellationToken stopping)
    {
        if (batch.Count == 0)
        {
            return (0, 0, 0);
        }

        var clock = Stopwatch.StartNew();
        try
        {
            var vectors = encoder.EncodePages(batch.Select(b => b.Page).ToList(), stopping);
            var seconds = clock.Elapsed.TotalSeconds;
            var results = WorkerStages.Time(stages.Writing, () => batch.Select((b, i) => (b.Job, VectorSetWire.Write(vectors[i]))).ToList());
            var done = WorkerStages.Time(stages.HandingBack, () => jobs.Finish(figures.Worker, results, encoder.Identity.Id));
            return (done, seconds, 0);
        }
        catch (Exception ex) when (ex is InvalidOperationException or ArgumentException or FormatException && batch.Count > 1)
        {
            log.LogWarning("A batch of {Pages} failed to encode ({Message}); trying its pages one by one.", batch.Count, ex.Message);
        }
        catch (Exception ex) when (ex is InvalidOperationException or ArgumentException or FormatException)
        {
            jobs.Fail(figures.Worker, batch[0].Job, JobFailure.Failed, ex.Message);
            return (0, clock.Elapsed.TotalSeconds, 1);
        }

        var (total, spent, lost) = (0, 0.0, 0);
        foreach (var one in batch)
        {
            var (d, s, f) = Encode([one], stopping);
            (total, spent, lost) = (total + d, spent + s, lost + f);
        }

        return (total, spent, lost);
    }

    private void Count(int done, int failed, double seconds, int taken)
    {
        lock (figuresGate)
        {
            figures = figures with
            {
                PagesDone = figures.PagesDone + done,
                PagesFailed = figures.PagesFailed + failed,
                EncoderSeconds = figures.EncoderSeconds + seconds,
                LeasesTakenOver = figures.LeasesTakenOver + taken,
            };
        }
    }

    /// <summary>The heartbeat: figures recorded, leases renewed. Out of reach, it is only logged (the loop reconnects).</summary>
    private void Beat()
    {
        WorkerFigures now;
        lock (figuresGate)
        {
            now = figures;
        }

        try
        {
            workers.Heartbeat(now, queue.HeartbeatSeconds);
            jobs.Renew(now.Worker, lease);
        }
        catch (Exception ex) when (QueueDatabase.IsUnreachable(ex) || ex is PostgresException)
        {
            log.LogDebug("Heartbeat not recorded: {Message}", ex.Message);
        }
    }

    /// <summary>At a stop: claims not handed back become claimable at once instead of at their lease's end.</summary>
    private void GiveBack()
    {
        try
        {
            var released = jobs.Release(figures.Worker);
            Beat();
            log.LogInformation("Worker {Worker} stopped: {Done} page(s) encoded, {Released} claim(s) given back.", figures.Worker, figures.PagesDone, released);
            log.LogInformation("Worker {Worker} time by stage: {Stages}", figures.Worker, stages.Describe(figures.EncoderSeconds, pages.Spent));
        }
        catch (Exception ex) when (QueueDatabase.IsUnreachable(ex))
        {
            log.LogWarning("Stopped without giving claims back ({Message}); their leases expire.", ex.Message);
        }
    }

    public void Dispose()
    {
        (encoder as IDisposable)?.Dispose();
        reader.Dispose();
        database.Dispose();
    }
}
