using System.Runtime.InteropServices;
using IndexKeeper.Core.Faults;

namespace IndexKeeper.Cli.CommandLine;

/// <summary>
/// Ctrl+C (SIGINT) and SIGTERM ask a command to stop: the first cancels its token, so the batch in flight
/// is committed whole or not at all and the command exits 130 (docs/cli.md, "Exit codes"); a second
/// signal ends the process at once, as the operating system would.
/// </summary>
internal sealed class StopSignals : IDisposable
{
    /// <summary>The shell's code for a command ended by SIGINT (128 + 2), used for SIGTERM alike.</summary>
    public const int ExitCode = 130;

    private readonly CancellationTokenSource cancellation = new();
    private readonly PosixSignalRegistration interrupt;
    private readonly PosixSignalRegistration terminate;

    public StopSignals()
    {
        interrupt = PosixSignalRegistration.Create(PosixSignal.SIGINT, OnSignal);
        terminate = PosixSignalRegistration.Create(PosixSignal.SIGTERM, OnSignal);
    }

    public CancellationToken Token => cancellation.Token;

    public bool Requested => cancellation.IsCancellationRequested;

    public void Dispose()
    {
        interrupt.Dispose();
        terminate.Dispose();
        cancellation.Dispose();
    }

    private void OnSignal(PosixSignalContext context)
    {
        context.Cancel = !cancellation.IsCancellationRequested;
        cancellation.Cancel();

        // Only after the cancel: a test holding the process at a fault point sees the stop where it sent it.
        FaultInjection.Resume();
    }
}
