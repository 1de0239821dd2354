namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>Choices for <see cref="IsolatedReaderFactory"/>. Setters reject bad values at once.</summary>
public sealed class IsolatedReaderOptions
{
    /// <summary>Smallest heap cap accepted: the runtime's minimum for a hard limit (16 MiB on 64-bit, from memory).</summary>
    public const long MinimumMemoryLimitBytes = 16L * 1024 * 1024;

    private long? workerMemoryLimitBytes = 2L * 1024 * 1024 * 1024;
    private TimeSpan startTimeout = TimeSpan.FromSeconds(30);
    private TimeSpan killGrace = TimeSpan.FromSeconds(2);

    /// <summary>The worker to start; null means this installation's own (<see cref="ReaderWorkerCommand.ForThisInstallation"/>).</summary>
    public ReaderWorkerCommand? WorkerCommand { get; set; }

    /// <summary>
    /// Cap on the worker's managed heap, passed as <c>DOTNET_GCHeapHardLimit</c>; a document that needs more
    /// ends in <see cref="QuarantineReason.ReaderOutOfMemory"/>. Null: no cap. Default 2 GiB.
    /// </summary>
    public long? WorkerMemoryLimitBytes
    {
        get => workerMemoryLimitBytes;
        set
        {
            if (value is < MinimumMemoryLimitBytes)
            {
                throw new ArgumentOutOfRangeException(
                    nameof(WorkerMemoryLimitBytes), value, $"The worker memory limit must be at least {MinimumMemoryLimitBytes} bytes, or null for none.");
            }

            workerMemoryLimitBytes = value;
        }
    }

    /// <summary>The worker's programs (LibreOffice, Tesseract, pdftoppm), OCR and e-mail bounds. Default <see cref="ReaderSettings.Default"/>.</summary>
    public ReaderSettings ReaderSettings { get; set; } = ReaderSettings.Default;

    /// <summary>How long a new worker may take to announce itself. Default 30 s.</summary>
    public TimeSpan StartTimeout
    {
        get => startTimeout;
        set
        {
            ArgumentOutOfRangeException.ThrowIfLessThanOrEqual(value, TimeSpan.Zero, nameof(StartTimeout));
            startTimeout = value;
        }
    }

    /// <summary>
    /// Time past <see cref="ReadLimits.ReadTimeout"/> before the worker is killed; the worker itself stops a
    /// cooperative read at the timeout, which spares a restart. Default 2 s.
    /// </summary>
    public TimeSpan KillGrace
    {
        get => killGrace;
        set
        {
            ArgumentOutOfRangeException.ThrowIfLessThan(value, TimeSpan.Zero, nameof(KillGrace));
            killGrace = value;
        }
    }
}
