using Microsoft.Extensions.Logging;

namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>
/// The supervisor: reads each document in a long-lived worker process, one read at a time, and replaces the
/// worker when a document kills it, stalls it past the watchdog or leaves it in doubt (out of memory, a fault).
/// </summary>
internal sealed class IsolatedDocumentReader : IIsolatedDocumentReader
{
    private readonly ReaderWorkerCommand command;
    private readonly long? memoryLimitBytes;
    private readonly ReaderSettings settings;
    private readonly TimeSpan startTimeout;
    private readonly TimeSpan killGrace;
    private readonly ILogger logger;

    // REQUIRES: gate is held to start, use or replace the worker. Dispose kills it without the gate so that
    // it need not wait for a read in flight.
    private readonly Lock gate = new();
    private volatile WorkerProcess? worker;
    private volatile bool disposed;
    private int workerStarts;

    public IsolatedDocumentReader(ReaderWorkerCommand command, long? memoryLimitBytes, ReaderSettings settings, TimeSpan startTimeout, TimeSpan killGrace, ILogger logger)
    {
        this.command = command;
        this.memoryLimitBytes = memoryLimitBytes;
        this.settings = settings;
        this.startTimeout = startTimeout;
        this.killGrace = killGrace;
        this.logger = logger;
    }

    public int WorkerStarts => Volatile.Read(ref workerStarts);

    /// <summary>Process id of the current worker, if one runs (for tests).</summary>
    internal int? WorkerProcessId => worker?.Id;

    /// <inheritdoc />
    /// <exception cref="InvalidOperationException">The worker cannot be started: a fault of the setup, not of the document.</exception>
    public DocumentContent Read(string path, ReadLimits limits, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(limits);
        var allowed = WatchdogFor(limits.ReadTimeout);
        var request = MessageCodec.Request(Path.GetFullPath(path), limits);
        lock (gate)
        {
            try
            {
                return ReadOnce(request, allowed, cancellationToken);
            }
            catch (DocumentReadException died) when (died.InnerException is EndOfStreamException or IOException)
            {
                // A worker also dies of causes outside the document (an operator, the kernel's out-of-memory
                // killer): blame the document only when a fresh worker dies on it too.
                WorkerLog.Retrying(logger, path, died.Message);
                try
                {
                    return ReadOnce(request, allowed, cancellationToken);
                }
                catch (DocumentReadException again) when (again.InnerException is EndOfStreamException or IOException)
                {
                    throw new DocumentReadException(again.Reason, again.Message + " (a fresh worker died on it too)", again.InnerException);
                }
            }
        }
    }

    // REQUIRES: gate is held.
    private DocumentContent ReadOnce(Frame request, TimeSpan? allowed, CancellationToken cancellationToken)
    {
        ObjectDisposedException.ThrowIf(disposed, this);
        cancellationToken.ThrowIfCancellationRequested();
        if (worker is { HasExited: true } idle)
        {
            Replace(idle, "it exited while idle");
        }

        var current = worker ??= StartWorker(cancellationToken);

        // Dispose may have come while the worker started; it waits on the gate to stop it.
        ObjectDisposedException.ThrowIf(disposed, this);
        current.Stderr.BeginRead();
        using var watchdog = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        if (allowed is { } due)
        {
            watchdog.CancelAfter(due);
        }

        Frame reply;
        try
        {
            reply = current.Exchange(request, watchdog.Token);
        }
        catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested)
        {
            Replace(current, "the read was cancelled");
            throw new OperationCanceledException(cancellationToken);
        }
        catch (OperationCanceledException)
        {
            var message = $"reading took longer than the watchdog of {allowed!.Value.TotalSeconds:0.#} s; the reader process was stopped";
            Replace(current, message);
            throw new DocumentReadException(QuarantineReason.ReadTimeout, message);
        }
        catch (Exception e) when (e is EndOfStreamException or IOException or ReaderProtocolException)
        {
            throw Died(current, e);
        }

        return Interpret(current, reply);
    }

    public void Dispose()
    {
        disposed = true;
        worker?.Kill();
        lock (gate)
        {
            worker?.Dispose();
            worker = null;
        }
    }

    /// <summary>How long a read may take before the worker is killed; null for no watchdog.</summary>
    private TimeSpan? WatchdogFor(TimeSpan readTimeout) =>
        readTimeout == Timeout.InfiniteTimeSpan || readTimeout >= TimeSpan.FromDays(1)
            ? null
            : readTimeout > TimeSpan.Zero
                ? readTimeout + killGrace
                : throw new ArgumentOutOfRangeException(nameof(readTimeout), readTimeout, "The read timeout must be positive or infinite.");

    private WorkerProcess StartWorker(CancellationToken cancellationToken)
    {
        var started = WorkerProcess.Start(command, memoryLimitBytes, settings, startTimeout, logger, cancellationToken);
        Interlocked.Increment(ref workerStarts);
        return started;
    }

    private DocumentContent Interpret(WorkerProcess current, Frame reply)
    {
        try
        {
            switch (reply.Type)
            {
                case FrameType.Content:
                    return MessageCodec.DecodeContent(reply);
                case FrameType.Refusal:
                    var refusal = MessageCodec.DecodeRefusal(reply);
                    if (refusal.Reason == QuarantineReason.ReaderOutOfMemory)
                    {
                        // A process that ran out of memory may be left in any state.
                        Replace(current, refusal.Message);
                    }

                    throw refusal;
                case FrameType.Fault:
                    var (type, text) = MessageCodec.DecodeFault(reply);
                    var message = $"the reader failed unexpectedly: {type}: {text}";
                    Replace(current, message);
                    throw new DocumentReadException(QuarantineReason.ReaderCrashed, message);
                default:
                    throw new ReaderProtocolException($"unexpected {reply.Type} frame in reply to a read");
            }
        }
        catch (ReaderProtocolException e)
        {
            throw Died(current, e);
        }
    }

    /// <summary>The worker stopped answering: learn how it ended, drop it, and name the reason.</summary>
    private Exception Died(WorkerProcess current, Exception cause)
    {
        if (cause is ReaderProtocolException)
        {
            current.Kill();
        }

        var ended = current.WaitForExit();
        var stderr = current.Stderr.Excerpt();
        var outOfMemory = stderr.Contains("OutOfMemory", StringComparison.Ordinal) || stderr.Contains("Out of memory", StringComparison.OrdinalIgnoreCase);
        var what = cause is ReaderProtocolException
            ? $"the reader process sent an invalid reply ({cause.Message})"
            : outOfMemory
                ? "the reader process ran out of memory"
                : "the reader process died reading this document";
        var message = what
            + (ended is null || cause is ReaderProtocolException ? string.Empty : $" ({ended})")
            + (stderr.Length == 0 ? string.Empty : $": {stderr}");
        Replace(current, message);
        if (disposed)
        {
            return new ObjectDisposedException(nameof(IsolatedDocumentReader), "The reader was disposed during the read.");
        }

        return new DocumentReadException(outOfMemory ? QuarantineReason.ReaderOutOfMemory : QuarantineReason.ReaderCrashed, message, cause);
    }

    // REQUIRES: gate is held.
    private void Replace(WorkerProcess current, string why)
    {
        WorkerLog.Stopped(logger, current.Id, why);
        current.Dispose();
        worker = null;
    }
}
