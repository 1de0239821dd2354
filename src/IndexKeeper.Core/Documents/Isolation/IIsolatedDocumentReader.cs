namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>
/// A document reader that reads in a supervised worker process. A document that crashes, stalls or exhausts
/// the worker ends in a <see cref="DocumentReadException"/> with its reason, and the next read gets a fresh
/// worker. Dispose stops the worker.
/// </summary>
public interface IIsolatedDocumentReader : IDocumentReader, IDisposable
{
    /// <summary>How many worker processes were started so far (restarts are this minus one).</summary>
    int WorkerStarts { get; }
}
