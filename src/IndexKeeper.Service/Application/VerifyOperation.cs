using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Service.Application;

/// <summary><c>verify</c>: integrity of catalog and segments (<see cref="IndexVerifier"/>); reads only, damage is reported per file.</summary>
public sealed class VerifyOperation(OpenIndex index)
{
    public VerifyReport Run(CancellationToken cancellationToken) =>
        IndexVerifier.Verify(index.Catalog, index.Words, index.Store.Directory, index.Encoder.Identity.Id, cancellationToken);
}
