using System.Diagnostics;
using System.ServiceProcess;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Search;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Hosting;
using IndexKeeper.Service.Querying;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// The daemon's one writer: on a dedicated thread it walks, scans changed paths, embeds what the gate
/// allows one batch at a time, applies declared drift (migration queue, switch-over), checks canaries inside
/// windows, compacts and samples figures. Between units of work it looks at the stop
/// request; the unit in flight gets the rest of the grace period (and is abandoned, uncommitted, after it).
/// With a work queue (Queue:Connection) the embedding itself is done by workers (<see cref="RemoteEmbedding"/>).
/// On the way out it seals the open segments.
/// </summary>
/// <remarks>REQUIRES: the index lock is held for the worker's whole life; nothing else writes the index.</remarks>
internal sealed class IndexWorker(
    IndexKeeperOptions options,
    IndexSettings settings,
    OpenIndex index,
    ScanOperation scan,
    ForgetRootOperation forget,
    EmbedBatchOperation embed,
    DriftOperation drift,
    CanaryOperation canaries,
    CompactOperation compaction,
    IServer server,
    DaemonState state,
    RootWatchers watchers,
    IEmbedGate gate,
    IHostApplicationLifetime lifetime,
    IHostLifetime hostLifetime,
    ILogger<IndexWorker> log,
    RemoteEmbedding? remote = null) : BackgroundService
{
    private readonly TimeSpan fullWalkInterval = TimeSpan.FromMinutes(options.Detect.FullWalkMinutes);
    private readonly TimeSpan sampleInterval = TimeSpan.FromSeconds(options.Daemon.SampleSeconds);
    private readonly TimeSpan compactInterval = TimeSpan.FromMinutes(options.Daemon.CompactEveryMinutes);
    private readonly TimeSpan grace = TimeSpan.FromSeconds(options.Daemon.ShutdownGraceSeconds);

    /// <summary>How often a sample after work checks the running counts against a full count (O(index); at 100k pages about a second of CPU an hour).</summary>
    private static readonly TimeSpan RecountInterval = TimeSpan.FromHours(1);

    private readonly WorkLoopSupervisor supervisor = new(
        new RetryPolicy(options.Daemon.FaultRetries + 1, TimeSpan.FromSeconds(options.Daemon.FaultRetryBaseSeconds), TimeSpan.FromMinutes(5)), state, log);

    private readonly CancellationTokenSource hardStop = new();
    private readonly TaskCompletionSource completion = new(TaskCreationOptions.RunContinuationsAsynchronously);
    private readonly Dictionary<string, DateTimeOffset> nextPoll = new(StringComparer.Ordinal);
    private readonly Dictionary<string, TimeSpan?> pollIntervals = new(StringComparer.Ordinal);
    private long embeddedSinceSample;
    private bool migrating;
    private DateTimeOffset? retrainTriedAt;
    private DateTimeOffset nextRetrainLook = DateTimeOffset.MinValue;

    // The last sample and the catalog commit count it was read at: an idle loop republishes it instead of
    // reading every document, page and vector-set record again (issue 13: idle CPU grew with the index).
    private DaemonFigures? lastSample;
    private long commitsAtSample = -1;
    private long commitsAtWordCheck = -1;
    private bool workSinceSample = true;
    private DateTimeOffset servingWrittenAt = DateTimeOffset.MinValue;
    private DateTimeOffset sampledFullyAt = DateTimeOffset.MinValue;
    private List<(long Id, long Length, long Written)> segmentFilesAtSample = [];

    // A sample after a commit reads the catalog's running counts (moved by each write, issue 15) and inspects only
    // segments that changed; the full recount that checks the counts runs at most once per RecountInterval.
    private readonly CleanSegments cleanSegments = new();
    private DateTimeOffset? recountedAt;

    /// <summary>Completes when the loop's thread has ended (or never started): only then may the index be closed.</summary>
    public Task Completion => completion.Task;

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        // Hard stop: a little before the host gives up, so sealing still fits in the grace period.
        stoppingToken.Register(() =>
        {
            try
            {
                hardStop.CancelAfter(grace * 0.8);
            }
            catch (ObjectDisposedException)
            {
                // The loop is over and the worker disposed: nothing left to stop.
            }
        });
        try
        {
            // Nothing is written before the host is up: a server that cannot bind never touches the index.
            await Task.Delay(Timeout.Infinite, CancellationTokenSource.CreateLinkedTokenSource(stoppingToken, lifetime.ApplicationStarted).Token).ConfigureAwait(false);
        }
        catch (OperationCanceledException)
        {
        }

        if (stoppingToken.IsCancellationRequested)
        {
            completion.TrySetResult();
            return;
        }

        _ = Task.Run(() => WarmServingView(stoppingToken), CancellationToken.None);
        await Task.Factory.StartNew(
            () =>
            {
                try
                {
                    Loop(stoppingToken);
                }
                finally
                {
                    completion.TrySetResult();
                }
            },
            CancellationToken.None,
            TaskCreationOptions.LongRunning,
            TaskScheduler.Default).ConfigureAwait(false);
    }

    public override void Dispose()
    {
        hardStop.Dispose();
        base.Dispose();
    }

    private void Loop(CancellationToken stopping)
    {
        try
        {
            // After a fault the supervisor retries, a new pass begins: its first turn walks every root, so paths
            // the failed turn had taken from the watchers are found.
            while (!Pass(stopping))
            {
            }
        }
        finally
        {
            SealOnExit();
            state.WorkLoopStopped();
            state.RunRequests();
        }
    }

    /// <summary>Turns of the loop until a stop request or a fault; false when the fault is to be retried with a new pass.</summary>
    private bool Pass(CancellationToken stopping)
    {
        var clock = state.Clock;
        var nextFullWalk = DateTimeOffset.MinValue;
        var nextSample = DateTimeOffset.MinValue;
        var nextCompaction = clock.GetUtcNow() + compactInterval;
        try
        {
            while (!stopping.IsCancellationRequested)
            {
                var now = clock.GetUtcNow();
                foreach (var gone in watchers.CheckRoots())
                {
                    ForgetRoot(gone);
                }

                workSinceSample |= state.RunRequests();
                var busy = false;
                if (now >= nextFullWalk)
                {
                    // At start too: whatever changed while the daemon was down is found by this walk.
                    FullWalk(settings.Scan.Roots.Where(IsPresent).ToList(), "run: full walk");
                    state.FullWalkDone(clock.GetUtcNow());
                    nextFullWalk = clock.GetUtcNow() + fullWalkInterval;
                    busy = true;
                }

                var polled = DuePolls(clock.GetUtcNow());
                if (polled.Count > 0)
                {
                    FullWalk(polled, "run: poll");
                    busy = true;
                }

                var (walks, settled, nextSettle) = watchers.Take(clock.GetUtcNow().UtcDateTime);
                if (walks.Count > 0)
                {
                    var specs = settings.Scan.Roots.Where(r => walks.Contains(r.Name) && IsPresent(r)).ToList();
                    FullWalk(specs, "run: root walk");
                    busy = true;
                }

                if (settled.Count > 0 && !stopping.IsCancellationRequested)
                {
                    Targeted(settled);
                    busy = true;
                }

                if (!stopping.IsCancellationRequested)
                {
                    // With a work queue the workers encode and this loop commits what they hand back.
                    busy |= remote is null ? EmbedOneBatch() : RemoteTurn(remote);
                }

                if (!busy && !stopping.IsCancellationRequested)
                {
                    busy |= CheckCanariesIfDue();
                }

                if (!busy && !stopping.IsCancellationRequested)
                {
                    busy |= RetrainIfDue();
                }

                workSinceSample |= busy;
                now = clock.GetUtcNow();
                if (now >= nextSample)
                {
                    Sample(now);
                    nextSample = now + sampleInterval;
                }

                if (now >= nextCompaction && !stopping.IsCancellationRequested)
                {
                    Compact();
                    nextCompaction = clock.GetUtcNow() + compactInterval;
                }

                SealByAge();
                supervisor.Succeeded();
                if (!busy)
                {
                    if (remote is not { Outstanding: true })
                    {
                        // As a local drain is never idle until the queue is empty: jobs out means the view is stale again within seconds.
                        KeepServingViewWarm(clock.GetUtcNow());
                    }

                    // Notifications, requests and stop requests wake the loop; the tick only serves root checks and samples.
                    var wait = TimeSpan.FromSeconds(Math.Min(5, sampleInterval.TotalSeconds));
                    var heedHandBacks = remote is not null;
                    if (remote is { Outstanding: true })
                    {
                        // Workers' hand-backs wake the loop (remote.Wake) unless they are left to gather; it also looks by
                        // itself, in case one was not heard.
                        var (look, heed) = remote.NextLook(clock.GetUtcNow());
                        wait = TimeSpan.FromTicks(Math.Min(look.Ticks, wait.Ticks));
                        heedHandBacks = heed;
                    }

                    if (nextSettle is { } settle)
                    {
                        wait = TimeSpan.FromTicks(Math.Clamp((settle - clock.GetUtcNow().UtcDateTime).Ticks, TimeSpan.FromMilliseconds(20).Ticks, wait.Ticks));
                    }

                    WaitHandle.WaitAny(heedHandBacks ? [watchers.Wake, state.RequestArrived, stopping.WaitHandle, remote!.Wake] : [watchers.Wake, state.RequestArrived, stopping.WaitHandle], wait);
                }
            }
        }
        catch (OperationCanceledException) when (stopping.IsCancellationRequested)
        {
            log.LogWarning("The unit of work in flight did not finish within the grace period; it was abandoned uncommitted.");
        }
        catch (Exception ex)
        {
            // A catalog read tells whether the index can still be used in this process (LiteDB answers every
            // call with its failure once a write failed).
            if (supervisor.Retry(ex, () => index.Catalog.Figures(), stopping))
            {
                return false;
            }

            // Exit 1 (DaemonHost): under systemd, Restart=on-failure starts a fresh process on the index. A
            // Windows service reports its own exit code when it stops; non-zero, with "sc failureflag"
            // (config/install-windows-service.ps1), makes the service manager's recovery restart it.
            if (OperatingSystem.IsWindows() && hostLifetime is ServiceBase service)
            {
                service.ExitCode = 1;
            }

            lifetime.StopApplication();
            return true;
        }

        log.LogInformation("Work loop stopped cleanly.");
        return true;
    }

    /// <summary>
    /// Present roots whose poll is due (docs/detect.md, "Network shares"); each root's interval is decided when
    /// it is first seen present, from its setting or from the file system it lies on.
    /// </summary>
    private List<RootSpec> DuePolls(DateTimeOffset now)
    {
        var due = new List<RootSpec>();
        foreach (var root in settings.Scan.Roots.Where(IsPresent))
        {
            if (PollInterval(root) is not { } interval)
            {
                continue;
            }

            if (!nextPoll.TryGetValue(root.Name, out var next))
            {
                // The start-up full walk has just read it.
                nextPoll[root.Name] = now + interval;
            }
            else if (now >= next)
            {
                due.Add(root);
                nextPoll[root.Name] = now + interval;
            }
        }

        return due;
    }

    private TimeSpan? PollInterval(RootSpec root)
    {
        if (pollIntervals.TryGetValue(root.Name, out var known))
        {
            return known;
        }

        var configured = options.Roots.FirstOrDefault(r => r.Name == root.Name)?.PollMinutes;
        var type = MountTable.FileSystemTypeOf(root.Path);
        var minutes = configured ?? (MountTable.IsNetwork(type) ? options.Detect.NetworkPollMinutes : 0);
        TimeSpan? interval = minutes > 0 ? TimeSpan.FromMinutes(minutes) : null;
        pollIntervals[root.Name] = interval;
        log.LogInformation(
            "Root {Root} lies on {Type}: {Polling}",
            root.Name,
            type ?? "an unknown file system",
            interval is { } i ? $"walked every {i.TotalMinutes:0.##} min besides change notifications" + (configured is null ? " (a network share: other clients' changes raise no notification)" : string.Empty) : "change notifications and the full walk only");
        return interval;
    }

    private bool IsPresent(RootSpec root) => state.Root(root.Name) is { MissingSinceUtc: null };

    private void FullWalk(IReadOnlyList<RootSpec> roots, string command)
    {
        if (roots.Count == 0)
        {
            return;
        }

        var summary = scan.Walk(command, roots, hardStop.Token);
        Log(command, summary);
        ReconcileDrift();
    }

    /// <summary>
    /// Records the active encoder and applies declared drift (docs/encoders.md): pages whose vectors are only
    /// under the serving encoder are queued for migration; when none are left, the switch-over happens.
    /// </summary>
    private void ReconcileDrift()
    {
        var decision = drift.Reconcile();
        if (decision.SwitchOver)
        {
            log.LogInformation("Migration complete: searches now rank with the active encoder {Encoder}.", index.Encoder.Identity.Id[..12]);
        }
        else if (decision.QueueForMigration.Count > 0)
        {
            log.LogInformation("Encoder changed: {Pages} page(s) queued for migration; searches keep the previous encoder until they are done.", decision.QueueForMigration.Count);
        }

        migrating = decision.Migrating;
    }

    /// <summary>Canaries are bulk work: only inside a window, only when the loop has nothing else to do.</summary>
    private bool CheckCanariesIfDue()
    {
        var now = state.Clock.GetUtcNow();
        if (!state.Allowance.WindowOpen || !canaries.Due(now.UtcDateTime))
        {
            return false;
        }

        var figures = canaries.Check(hardStop.Token);
        state.Canaries = figures;
        if (figures.Drifted)
        {
            log.LogWarning(
                "Canary check: silent drift — mean cosine {Mean:0.0000}, minimum {Minimum:0.0000} over {Pages} page(s), {Mismatched} with another vector count.",
                figures.MeanCosine, figures.MinimumCosine, figures.Pages, figures.MismatchedPages);
        }
        else
        {
            log.LogInformation("Canary check: {Pages} page(s) match (mean cosine {Mean:0.0000}).", figures.Pages, figures.MeanCosine);
        }

        return true;
    }

    /// <summary>
    /// Retraining of the serving view's centroids is bulk work (docs/search.md, "Retraining"): asked when the loop
    /// is idle, run only when the decision says due and a window is open long enough for its estimated cost.
    /// Reads the view's running figures only, so asking costs the idle loop nothing it would notice.
    /// </summary>
    private bool RetrainIfDue()
    {
        var now = state.Clock.GetUtcNow();
        if (now < nextRetrainLook)
        {
            return false;
        }

        nextRetrainLook = now + TimeSpan.FromMinutes(1);
        var encoderId = ServingEncoderId;
        if (settings.Candidates != CandidateSource.Centroids || index.Serving.Retraining(encoderId, retrainTriedAt) is not { } facts)
        {
            return false;
        }

        var outlook = RetrainingOutlook.Of(facts, settings, index.Serving, now);
        state.Retraining = outlook;
        if (!outlook.Decision.Due || outlook.StartsAt != now)
        {
            return false;
        }

        retrainTriedAt = now;
        log.LogInformation("Retraining the serving view's centroids: {Reason}; about {Seconds:0} CPU s.", outlook.Decision.Reason, outlook.EstimatedSeconds);
        ViewRetraining outcome;
        try
        {
            outcome = index.Serving.Retrain(encoderId, now, hardStop.Token);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or InvalidOperationException)
        {
            // The view is a cache and the old one still serves: a failed retraining is logged and tried again in a day.
            log.LogWarning("The serving view was not retrained: {Message}", ex.Message);
            return true;
        }

        log.LogInformation(
            "Serving view retrained in {Seconds:0.0} s ({Centroids} centroids, {Pages} pages): recall figure {Before:0.000} before, {After:0.000} after; {Outcome}.",
            outcome.BuildWallSeconds, outcome.Centroids, outcome.Pages, outcome.Before.Recall, outcome.After.Recall, outcome.Swapped ? "the new view serves" : "the old view is kept (the new one was worse)");
        index.Serving.Persist(CancellationToken.None);
        state.CandidateRecall = index.Serving.LastRecall(encoderId, readFile: false);
        state.Retraining = outlook with { Facts = index.Serving.Retraining(encoderId, retrainTriedAt) ?? facts, StartsAt = null };
        return true;
    }

    private void Targeted(IReadOnlyList<ChangedPath> settled)
    {
        // A folder event (created, moved in or out, deleted) is not worth untangling path by path: walk its root.
        var files = new List<ChangedPath>();
        var walk = new HashSet<string>(StringComparer.Ordinal);
        var rootPaths = settings.RootPaths;
        foreach (var path in settled)
        {
            if (!rootPaths.TryGetValue(path.Root, out var rootPath))
            {
                continue;
            }

            var full = Path.Combine(rootPath, path.RelativePath.Replace('/', Path.DirectorySeparatorChar));
            var kind = FileStatReader.Read(full).Kind;
            if (kind == EntryKind.Directory || (kind == EntryKind.Missing && index.Catalog.Documents.Find(path.Root, path.RelativePath) is null && !LooksLikeFile(path)))
            {
                walk.Add(path.Root);
            }
            else
            {
                files.Add(path);
            }
        }

        if (files.Count > 0)
        {
            var summary = scan.Paths("run: changes", files, hardStop.Token);
            Log("run: changes", summary);
            if (summary.DocumentsDeferred > 0)
            {
                // Still being written: look again once they have been quiet.
                watchers.NoteAgain(files);
            }
        }

        foreach (var root in walk)
        {
            watchers.RequestWalk(root);
        }
    }

    /// <summary>A vanished path with a document type's extension was a file nobody indexed (a temp file); with none it may have been a folder.</summary>
    private static bool LooksLikeFile(ChangedPath path) => Path.HasExtension(path.RelativePath);

    private bool EmbedOneBatch()
    {
        var now = state.Clock.GetUtcNow();
        var allowance = gate.Allowance(now, index.Catalog.Counts.Due(now.UtcDateTime));
        state.Allowance = allowance;
        if (allowance.MaxPages <= 0)
        {
            return false;
        }

        // A few batches per turn: changes and stop requests are looked at in between, and the embed
        // history (one record per call, for the plan's throughput) does not get a record per batch.
        var batch = Math.Min(allowance.MaxPages, settings.EmbedBatchSize * 4L);
        var summary = new ScanSummary();
        var stopwatch = Stopwatch.StartNew();
        var embedded = embed.Run(summary, batch, allowance.LowestPriority, null, hardStop.Token);
        foreach (var problem in summary.Problems)
        {
            log.LogWarning("Embed: {Problem}", problem);
        }

        if (embedded > 0)
        {
            gate.Spent(now, embedded);
            state.CountEmbedded(embedded);
            Interlocked.Add(ref embeddedSinceSample, embedded);
            log.LogDebug("Embedded {Pages} page(s) in {Seconds:0.000} s.", embedded, stopwatch.Elapsed.TotalSeconds);
            if (migrating && index.Catalog.Queue.Depths()[QueuePriority.Migration] == 0)
            {
                ReconcileDrift();
            }
        }

        return embedded > 0 || summary.PagesFailed > 0;
    }

    /// <summary>One turn over the work queue; as after a local batch, declared drift is reconciled once the migration queue is empty.</summary>
    private bool RemoteTurn(RemoteEmbedding queue)
    {
        var busy = queue.Turn(EmbedOneBatch);
        if (busy && migrating && index.Catalog.Queue.Depths()[QueuePriority.Migration] == 0)
        {
            ReconcileDrift();
        }

        return busy;
    }

    private void ForgetRoot(string root)
    {
        if (!index.Catalog.Documents.OfRoot(root).Any())
        {
            return;
        }

        log.LogWarning("Root {Root} has been gone longer than Detect:RootGoneGraceHours; removing its documents from the index.", root);
        var summary = forget.Run("run: root gone", root, hardStop.Token);
        Log("run: root gone", summary);
    }

    private void Compact()
    {
        // The word files are weighed by a pass over every page record: only when a commit may have changed them.
        var commits = index.Catalog.Commits;
        var wordsMayBeDue = commits != commitsAtWordCheck;
        commitsAtWordCheck = commits;
        if (compaction.Jobs().Count == 0 && (!wordsMayBeDue || compaction.WordFiles().Count == 0))
        {
            return;
        }

        var report = compaction.Run(hardStop.Token);
        commitsAtWordCheck = index.Catalog.Commits;
        log.LogInformation(
            "Compaction: {Jobs} job(s), {Segments} segment(s) rewritten, {Reclaimed} bytes reclaimed; page words: {WordFiles} file(s) rewritten, {WordDeleted} deleted, {WordReclaimed} bytes reclaimed.",
            report.Jobs, report.SegmentsRewritten, report.BytesReclaimed, report.Words.FilesRewritten, report.Words.FilesDeleted, report.Words.BytesReclaimed);
        foreach (var damaged in report.Words.Damaged)
        {
            log.LogWarning("Compaction: {Damage}", damaged);
        }
    }

    private void SealByAge()
    {
        if (index.Store.OldestOpenSince() is { } since && state.Clock.GetUtcNow() - since >= settings.Segments.SealAtAge)
        {
            workSinceSample = true;
            index.Store.SealAll();
        }
    }

    /// <summary>
    /// When idle: brings the serving view up to date (so the first search after a start or a sync does not pay
    /// for it) and writes it for command-line searches, at most once a minute and only when the catalog moved.
    /// </summary>
    private void KeepServingViewWarm(DateTimeOffset now)
    {
        if (now - servingWrittenAt < TimeSpan.FromMinutes(1))
        {
            return;
        }

        servingWrittenAt = now;
        try
        {
            index.Serving.Persist(CancellationToken.None);
            // Only the view held in memory: reading the file here would cost the idle daemon a pass over it a minute.
            state.CandidateRecall = index.Serving.LastRecall(ServingEncoderId, readFile: false);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or InvalidOperationException)
        {
            // A cache of the catalog: searches build it in memory when the file is stale, so this is only logged.
            log.LogWarning("The serving view was not written: {Message}", ex.Message);
        }
    }

    /// <summary>
    /// Beside the loop, once at start: one search through the daemon's own API, as a client makes it, loads the
    /// serving view and checks each record it names once, and, with words of an indexed page as the query so it
    /// has hits, also reads their documents and words and writes the answer. So the code of the whole request is
    /// compiled and the catalog pages it reads are loaded before the first real search, which then costs what a
    /// warm one does (docs/daemon.md, "Warm-up"). Then the serving encoder's segments are read ahead
    /// (<see cref="SegmentReadAhead"/>) when the setting allows and they fit. Only reads; a failure is logged and
    /// left to the searches.
    /// </summary>
    private void WarmServingView(CancellationToken stopping)
    {
        try
        {
            var clock = Stopwatch.StartNew();
            var catalog = index.Catalog;
            var page = catalog.Pages.ReferencedKeys().FirstOrDefault() is { } key ? catalog.Pages.Find(key) : null;
            var words = page is null ? [] : PageInput.WordsOf(page, index.Words).Take(8).Select(w => w.Text).ToList();
            var bound = server.Features.Get<IServerAddressesFeature>()?.Addresses.FirstOrDefault()
                ?? throw new InvalidOperationException("the API has no address to send the warm-up search to");
            using var client = DaemonClient.At(new Uri(DaemonEndpoint.ClientUrlOf(bound)), BearerTokens.Resolve(options.Daemon), TimeSpan.FromMinutes(10));
            var query = Uri.EscapeDataString(words.Count > 0 ? string.Join(' ', words) : "warm");
            var hits = client.Get<SearchReport>($"/api/search?k=10&q={query}").Hits.Count;
            log.LogInformation("Serving view warmed in {Seconds:0.00} s ({Hits} hit(s) for the warm-up query); {Segments}.", clock.Elapsed.TotalSeconds, hits, ReadAhead(stopping));
        }
        catch (OperationCanceledException) when (stopping.IsCancellationRequested)
        {
        }
        catch (Exception ex) when (ex is not OutOfMemoryException)
        {
            log.LogWarning("The serving view was not warmed at start: {Message}", ex.Message);
        }
    }

    /// <summary>The encoder whose vectors searches use: the catalog's serving one, else (a fresh index) the active one.</summary>
    private string ServingEncoderId => index.Catalog.Encoders.ServingId() ?? index.Encoder.Identity.Id;

    /// <summary>The warm-up's read-ahead of the serving encoder's segments, or why there was none; what the log says of it.</summary>
    private string ReadAhead(CancellationToken stopping)
    {
        if (!options.Daemon.ReadAheadSegments)
        {
            return "segments not read ahead (Daemon:ReadAheadSegments is false)";
        }

        var (segments, bytes) = SegmentReadAhead.Of(index.Catalog, ServingEncoderId);
        var memory = GC.GetGCMemoryInfo().TotalAvailableMemoryBytes;
        if (!SegmentReadAhead.Fits(bytes, memory))
        {
            return FormattableString.Invariant($"segments not read ahead: {bytes / 1e9:0.0} GB is more than a quarter of the {memory / 1e9:0.0} GB of memory");
        }

        var clock = Stopwatch.StartNew();
        var read = SegmentReadAhead.Read(index.Store.Directory, segments, stopping);
        return FormattableString.Invariant($"{read / 1e6:0} MB of segments read ahead in {clock.Elapsed.TotalSeconds:0.0} s");
    }

    private void Sample(DateTimeOffset now)
    {
        var catalog = index.Catalog;
        if (!workSinceSample && catalog.Commits == commitsAtSample && lastSample is not null)
        {
            // Nothing was done and nothing committed since the last read. This process is the index's one
            // writer, so the catalog's figures stand; only the clock, the disk and the segment files (removed or
            // cut by hand) can move. The files are looked at every five minutes, by their catalog records and
            // their sizes (per segment, not per page); only a difference pays for the full survey below.
            if (now - sampledFullyAt < TimeSpan.FromMinutes(5))
            {
                state.Publish(lastSample with { At = now, FreeShare = FreeShare() }, Interlocked.Exchange(ref embeddedSinceSample, 0));
                return;
            }

            var files = SegmentFiles();
            if (files.SequenceEqual(segmentFilesAtSample))
            {
                sampledFullyAt = now;
                lastSample = lastSample with { At = now, FreeShare = FreeShare(), BytesOnDisk = DirectorySize.Of(index.Directory) };
                state.Publish(lastSample, Interlocked.Exchange(ref embeddedSinceSample, 0));
                return;
            }
        }

        workSinceSample = false;
        commitsAtSample = catalog.Commits;
        sampledFullyAt = now;
        segmentFilesAtSample = SegmentFiles();
        var counts = catalog.Counts;
        counts.Refresh();
        if (recountedAt is null)
        {
            // The first refresh counted everything.
            recountedAt = now;
        }
        else if (now - recountedAt >= RecountInterval)
        {
            recountedAt = now;
            foreach (var difference in counts.Recount())
            {
                log.LogWarning("The running figures disagreed with a full count ({Difference}); the full count is used from now on.", difference);
            }
        }

        var servingId = ServingEncoderId;
        var coverage = counts.Coverage(servingId, index.Encoder.Identity.Id);
        var figures = counts.Figures();
        var depths = counts.Depths();
        var segments = catalog.Segments.All();
        var segmentBytes = segments.Sum(s => s.Length);
        var free = FreeShare();

        var lastScan = catalog.History.LastScan();
        var latest = new DaemonFigures(
            now,
            figures.Documents,
            figures.QuarantinedDocuments,
            figures.UnsupportedDocuments,
            lastScan?.Counts.GetValueOrDefault(ScanRecord.FilesSkippedByPatternKey) ?? 0,
            lastScan?.Counts.GetValueOrDefault(ScanRecord.FilesUnsupportedKey) ?? 0,
            figures.Pages,
            counts.LiveVectorSets,
            depths[QueuePriority.Fresh],
            depths[QueuePriority.Migration],
            depths[QueuePriority.Canary],
            figures.Queued - depths.Values.Sum(),
            segments.Count(s => !s.Sealed),
            segments.Count(s => s.Sealed),
            segmentBytes == 0 ? 0 : 1.0 - ((double)segments.Sum(s => s.LiveBytes) / segmentBytes),
            DirectorySize.Of(index.Directory),
            free,
            DamageSurvey.RunRunning(catalog, index.Store.Directory, servingId, coverage, cleanSegments, CancellationToken.None));
        latest = FigureSurvey.Complete(latest, index, gate, servingId, coverage);
        lastSample = latest;
        state.Publish(latest, Interlocked.Exchange(ref embeddedSinceSample, 0));
    }

    /// <summary>Each segment the catalog names with its file's length (-1 when missing) and last write: what can change without a commit.</summary>
    private List<(long Id, long Length, long Written)> SegmentFiles() =>
        index.Catalog.Segments.All().Select(segment =>
        {
            var file = new FileInfo(SegmentFileNames.PathOf(index.Store.Directory, segment.Id));
            return file.Exists ? (segment.Id, file.Length, file.LastWriteTimeUtc.Ticks) : (segment.Id, -1L, 0L);
        }).ToList();

    private double? FreeShare()
    {
        try
        {
            var drive = new DriveInfo(index.Directory);
            return drive.TotalSize > 0 ? (double)drive.AvailableFreeSpace / drive.TotalSize : null;
        }
        catch (Exception ex) when (ex is IOException or ArgumentException or UnauthorizedAccessException)
        {
            log.LogDebug("Free space of the index volume unknown: {Message}", ex.Message);
            return null;
        }
    }

    private void SealOnExit()
    {
        try
        {
            index.Store.SealAll();
        }
        catch (Exception ex)
        {
            // The open segment stays open; the next start reopens or repairs it. After a fault the catalog may
            // refuse any further use (LiteDB after a failed write); the loop's own outcome decides the exit.
            log.LogWarning("Could not seal the open segment at shutdown: {Message}", ex.Message);
        }
    }

    private void Log(string what, ScanSummary summary)
    {
        if (summary.DocumentsNew + summary.DocumentsChanged + summary.DocumentsDeleted + summary.DocumentsQuarantined > 0)
        {
            log.LogInformation(
                "{What}: {New} new, {Changed} changed, {Deleted} deleted, {Moved} moved, {Quarantined} quarantined; {PagesNew} page(s) queued, {Seconds:0.00} s.",
                what, summary.DocumentsNew, summary.DocumentsChanged, summary.DocumentsDeleted, summary.DocumentsMoved, summary.DocumentsQuarantined, summary.PagesNew, summary.ElapsedSeconds);
        }

        foreach (var problem in summary.Problems.Take(20))
        {
            log.LogWarning("{What}: {Problem}", what, problem);
        }
    }
}
