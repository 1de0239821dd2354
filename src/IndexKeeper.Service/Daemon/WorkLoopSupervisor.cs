using System.Globalization;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Storage;
using Microsoft.Extensions.Logging;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// Decides what a fault of the work loop means (docs/daemon.md, "Faults"). After an I/O fault (disk full,
/// too many open files, a share that dropped) it asks whether the index can still be used in this
/// process; if so, the fault is logged, shown in health as degraded with its reason, and the loop tries
/// again after a back-off (<paramref name="retry"/>: doubling from Daemon:FaultRetryBaseSeconds); the first
/// turn that succeeds clears it. Any other fault, damage read from a segment, an index that can no longer
/// be used (LiteDB refuses every use after a failed write), or an I/O fault still there after
/// Daemon:FaultRetries tries ends the loop: health says so, and the process exits 1 for the service
/// manager to start it afresh on the last committed state.
/// </summary>
/// <remarks>REQUIRES: used by the work loop's thread only.</remarks>
internal sealed class WorkLoopSupervisor(RetryPolicy retry, DaemonState state, ILogger log)
{
    private int failures;

    /// <summary>A fault that may clear by itself while the process waits.</summary>
    public static bool IsTransient(Exception fault) => fault is IOException and not SegmentFormatException;

    /// <summary>A turn of the loop went through: a fault being retried is over.</summary>
    public void Succeeded()
    {
        if (failures > 0)
        {
            log.LogInformation("The work loop carries on after {Failures} failed turn(s).", failures);
            state.WorkLoopRecovered();
            failures = 0;
        }
    }

    /// <summary>
    /// After a failed turn: true once the back-off is waited out (requests for the loop's thread are served
    /// meanwhile) and the loop may try again; false when it must end (the failure is recorded in health).
    /// </summary>
    /// <param name="checkIndex">Throws when the index can no longer be used in this process.</param>
    public bool Retry(Exception fault, Action checkIndex, CancellationToken stopping)
    {
        ArgumentNullException.ThrowIfNull(fault);
        ArgumentNullException.ThrowIfNull(checkIndex);
        var now = state.Clock.GetUtcNow().UtcDateTime;
        if (!IsTransient(fault) || retry.NextTry(++failures, now) is not { } next)
        {
            return Failed(fault);
        }

        try
        {
            checkIndex();
        }
        catch (Exception unusable)
        {
            return Failed(unusable, fault);
        }

        var retries = retry.MaxAttempts - 1;
        state.WorkLoopFaulted(string.Create(CultureInfo.InvariantCulture, $"{fault.Message} (retry {failures} of {retries} at {next:HH:mm:ss}Z)"));
        log.LogError("The work loop hit a fault: {Message}; retry {Failures} of {Retries} in {Seconds:0.##} s.", fault.Message, failures, retries, (next - now).TotalSeconds);
        var until = state.Clock.GetUtcNow() + (next - now);
        for (var left = next - now; left > TimeSpan.Zero && !stopping.IsCancellationRequested; left = until - state.Clock.GetUtcNow())
        {
            if (WaitHandle.WaitAny([stopping.WaitHandle, state.RequestArrived], left) == 1)
            {
                state.RunRequests();
            }
        }

        return true;
    }

    /// <summary>Health turns unhealthy; the HTTP side answers until the host has stopped so operators can see why.</summary>
    private bool Failed(Exception fault, Exception? firstFault = null)
    {
        state.WorkLoopFailed();
        if (firstFault is null)
        {
            log.LogCritical(fault, "The work loop stopped: {Message}", fault.Message);
        }
        else
        {
            log.LogCritical(fault, "The work loop hit a fault ({Fault}) after which the index cannot be used in this process ({Message}); exiting for a restart.", firstFault.Message, fault.Message);
        }

        return false;
    }
}
