using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Logging.Abstractions;

namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>Hands out document readers that read in a supervised worker process.</summary>
public static class IsolatedReaderFactory
{
    /// <summary>
    /// Creates a reader; its worker starts on the first read and stays alive across documents.
    /// Worker stderr lines and restarts go to <paramref name="logger"/>.
    /// </summary>
    /// <exception cref="InvalidOperationException">No worker command was given and none is installed.</exception>
    public static IIsolatedDocumentReader Create(IsolatedReaderOptions options, ILogger? logger = null)
    {
        ArgumentNullException.ThrowIfNull(options);
        return new IsolatedDocumentReader(
            options.WorkerCommand ?? ReaderWorkerCommand.ForThisInstallation(),
            options.WorkerMemoryLimitBytes,
            options.ReaderSettings,
            options.StartTimeout,
            options.KillGrace,
            logger ?? NullLogger.Instance);
    }
}
