namespace IndexKeeper.Core.Detect;

/// <summary>Enumerates the regular files of a root, lazily and in a reproducible order.</summary>
public interface IRootWalker
{
    /// <summary>
    /// Yields every regular file under <paramref name="root"/> that its globs select, folder by folder in
    /// ordinal name order (depth first). Links are never followed out of the root; links to folders are
    /// never descended. Nothing the file system does makes it throw: each entry passed over goes to
    /// <paramref name="onProblem"/>, a missing root as <see cref="WalkProblemKind.RootMissing"/>. Each regular
    /// file the globs did not select goes to <paramref name="onPassedOver"/>, so nothing is dropped uncounted.
    /// </summary>
    /// <exception cref="OperationCanceledException">When <paramref name="cancellationToken"/> fires.</exception>
    IEnumerable<FoundFile> Walk(RootSpec root, Action<WalkProblem> onProblem, Action<PassedOverFile>? onPassedOver = null, CancellationToken cancellationToken = default);
}
