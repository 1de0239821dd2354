using System.Collections.Concurrent;
using System.Threading.Channels;
using IndexKeeper.Core.Drift;
using IndexKeeper.Core.Health;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Search;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.WorkQueue;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// What the work loop, the watchers and the HTTP side share: the latest figures, root states, counters and
/// the chart's samples. Written by the work loop and the watchers, read by HTTP threads and metrics; every
/// member is safe to use from any thread.
/// </summary>
internal sealed class DaemonState(TimeProvider clock, int ringCapacity)
{
    private readonly ConcurrentDictionary<string, RootState> roots = new(StringComparer.Ordinal);
    private readonly ConcurrentQueue<(DateTimeOffset At, long Quarantined)> quarantineHistory = new();
    private long watcherOverflows;
    private long pagesEmbedded;
    private long lastFullWalkTicks = -1;
    private volatile bool workLoopRunning = true;
    private volatile bool workLoopFailed;
    private volatile DaemonFigures figures = DaemonFigures.Empty;
    private volatile EmbedAllowance allowance = EmbedAllowance.Initial;
    private volatile CanaryFigures? canaries;
    private volatile CandidateRecall? candidateRecall;
    private volatile RetrainingOutlook? retraining;
    private volatile string? workLoopFault;
    private volatile WorkQueueFigures? workQueue;
    private long pagesEmbeddedRemotely;
    private readonly Lock searchOutcomes = new();
    private DateTimeOffset? lastSearchFailure;
    private string? lastSearchFailureReason;
    private DateTimeOffset? lastSearchSuccess;
    private double pagesPerSecond;
    private readonly Channel<Action> requests = Channel.CreateBounded<Action>(new BoundedChannelOptions(16) { SingleReader = true });
    private readonly AutoResetEvent requestArrived = new(false);

    public DateTimeOffset Started { get; } = clock.GetUtcNow();

    public TimeProvider Clock => clock;

    public SampleRing Samples { get; } = new(ringCapacity);

    public DaemonFigures Figures => figures;

    public EmbedAllowance Allowance
    {
        get => allowance;
        set => allowance = value;
    }

    public double PagesPerSecond => Volatile.Read(ref pagesPerSecond);

    /// <summary>The last recall figure of the serving view's candidates (null when none was measured).</summary>
    public CandidateRecall? CandidateRecall
    {
        get => candidateRecall;
        set => candidateRecall = value;
    }

    /// <summary>The retraining decision the idle work loop last took (null before one, or without centroid lists).</summary>
    public RetrainingOutlook? Retraining
    {
        get => retraining;
        set => retraining = value;
    }

    /// <summary>The last canary check of this daemon's life (null before the first).</summary>
    public CanaryFigures? Canaries
    {
        get => canaries;
        set => canaries = value;
    }

    public long WatcherOverflows => Interlocked.Read(ref watcherOverflows);

    /// <summary>The work queue as the coordinator last saw it; null without Queue:Connection.</summary>
    public WorkQueueFigures? WorkQueue
    {
        get => workQueue;
        set => workQueue = value;
    }

    /// <summary>Pages committed from workers' vector sets (also counted in <see cref="PagesEmbedded"/>).</summary>
    public long PagesEmbeddedRemotely => Interlocked.Read(ref pagesEmbeddedRemotely);

    public void CountRemote(long pages) => Interlocked.Add(ref pagesEmbeddedRemotely, pages);

    public long PagesEmbedded => Interlocked.Read(ref pagesEmbedded);

    public bool WorkLoopRunning => workLoopRunning;

    public DateTimeOffset? LastFullWalk => Interlocked.Read(ref lastFullWalkTicks) is var t and >= 0 ? new DateTimeOffset(t, TimeSpan.Zero) : null;

    public IReadOnlyList<RootState> Roots => roots.Values.OrderBy(r => r.Name, StringComparer.Ordinal).ToList();

    /// <summary>Set when a request for the work loop's thread arrives.</summary>
    public WaitHandle RequestArrived => requestArrived;

    /// <summary>
    /// Runs <paramref name="work"/> on the work loop's thread between two units of work (the document reader
    /// and the writer's state belong to that thread). Full (16 waiting) means busy: the caller says so.
    /// </summary>
    public Task<T> OnWorkLoop<T>(Func<T> work)
    {
        var done = new TaskCompletionSource<T>(TaskCreationOptions.RunContinuationsAsynchronously);
        if (!workLoopRunning)
        {
            done.SetException(new InvalidOperationException("the work loop has stopped"));
        }
        else if (!requests.Writer.TryWrite(() =>
        {
            try
            {
                done.SetResult(work());
            }
            catch (Exception ex)
            {
                done.SetException(ex);
            }
        }))
        {
            done.SetException(new InvalidOperationException("the work loop has too many requests waiting; try again shortly"));
        }

        requestArrived.Set();
        return done.Task;
    }

    /// <summary>Runs the waiting requests; called by the work loop only.</summary>
    /// <summary>Runs the queued requests on the calling (work loop) thread; true when there was any.</summary>
    public bool RunRequests()
    {
        var ran = false;
        while (requests.Reader.TryRead(out var request))
        {
            request();
            ran = true;
        }

        return ran;
    }

    public void SetRoot(RootState root) => roots[root.Name] = root;

    public RootState? Root(string name) => roots.GetValueOrDefault(name);

    public void CountOverflow() => Interlocked.Increment(ref watcherOverflows);

    public void CountEmbedded(long pages) => Interlocked.Add(ref pagesEmbedded, pages);

    public void FullWalkDone(DateTimeOffset at) => Interlocked.Exchange(ref lastFullWalkTicks, at.UtcTicks);

    /// <summary>The loop ended (stop request or failure): health says so and requests are refused.</summary>
    public void WorkLoopStopped() => workLoopRunning = false;

    /// <summary>The loop ended on an error: the process exits with 1.</summary>
    public void WorkLoopFailed() => workLoopFailed = true;

    public bool HasWorkLoopFailed => workLoopFailed;

    /// <summary>The loop hit a fault it backs off from and retries: health says degraded with this reason.</summary>
    public void WorkLoopFaulted(string reason) => workLoopFault = reason;

    /// <summary>A turn succeeded after a fault.</summary>
    public void WorkLoopRecovered() => workLoopFault = null;

    public void SearchFailed(string reason)
    {
        lock (searchOutcomes)
        {
            lastSearchFailure = clock.GetUtcNow();
            lastSearchFailureReason = reason;
        }
    }

    public void SearchSucceeded()
    {
        lock (searchOutcomes)
        {
            lastSearchSuccess = clock.GetUtcNow();
        }
    }

    /// <summary>Takes a new sample of the figures; pages/s is the embedding rate since the previous sample.</summary>
    public void Publish(DaemonFigures latest, long embeddedSincePrevious)
    {
        var previous = figures;
        var seconds = previous.At == DateTimeOffset.MinValue ? 0 : (latest.At - previous.At).TotalSeconds;
        var rate = seconds > 0 ? embeddedSincePrevious / seconds : 0;
        Volatile.Write(ref pagesPerSecond, rate);
        figures = latest;
        Samples.Add(new Sample(latest.At, latest.Queued, Math.Round(rate, 3)));
        var quarantined = latest.DocumentsQuarantined + latest.PagesQuarantined;
        quarantineHistory.Enqueue((latest.At, quarantined));
        while (quarantineHistory.TryPeek(out var oldest) && latest.At - oldest.At > TimeSpan.FromHours(1) && quarantineHistory.Count > 1)
        {
            quarantineHistory.TryDequeue(out _);
        }
    }

    private static string? DamageText(DamageReport damage) =>
        damage.SegmentsMissing == 0 && damage.VectorSetsUnreadable == 0 && damage.PagesWithoutVectorsNotQueued == 0
            ? null
            : string.Create(System.Globalization.CultureInfo.InvariantCulture, $"{damage.SegmentsMissing} segment file(s) missing, {damage.VectorSetsUnreadable} vector set(s) unreadable, {damage.PagesWithoutVectorsNotQueued} page(s) without vectors and not queued");

    /// <summary>The snapshot the health rules judge.</summary>
    public HealthSnapshot HealthSnapshot()
    {
        var now = clock.GetUtcNow();
        var latest = figures;
        long? earlier = quarantineHistory.TryPeek(out var oldest) && now - oldest.At >= TimeSpan.FromMinutes(55) ? oldest.Quarantined : null;
        var rootStates = Roots;
        var rate = PagesPerSecond;
        var allowed = allowance;
        DateTimeOffset? finish = latest.Queued > 0 && rate > 0 ? now + TimeSpan.FromSeconds(latest.Queued / rate) : null;
        DateTimeOffset? searchFailed;
        string? searchFailure;
        bool succeededSince;
        lock (searchOutcomes)
        {
            searchFailed = lastSearchFailure;
            searchFailure = lastSearchFailureReason;
            succeededSince = lastSearchSuccess > lastSearchFailure;
        }

        return new HealthSnapshot(
            workLoopRunning,
            now - Started,
            rootStates.Where(r => r.MissingSinceUtc is not null).Select(r => r.Name).ToList(),
            rootStates.Where(r => r.MissingSinceUtc is null && !r.Watching).Select(r => r.Name).ToList(),
            LastFullWalk is { } walk ? now - walk : null,
            finish,
            allowed.WindowEnd,
            latest.QueuedMigration,
            latest.DeadRatio,
            latest.FreeShare,
            latest.DocumentsQuarantined + latest.PagesQuarantined,
            earlier,
            Canaries is { Drifted: true } c
                ? string.Create(System.Globalization.CultureInfo.InvariantCulture, $"mean cosine {c.MeanCosine:0.0000}, minimum {c.MinimumCosine:0.0000} over {c.Pages} pages")
                : null,
            workLoopFault,
            now - searchFailed,
            searchFailure,
            succeededSince,
            DamageText(latest.Damage),
            workQueue?.Fault,
            candidateRecall?.Recall);
    }
}
