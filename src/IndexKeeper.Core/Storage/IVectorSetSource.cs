namespace IndexKeeper.Core.Storage;

/// <summary>
/// The live vector sets of one encoder, numbered 0..Count-1, as search reads them. Implementations are
/// safe for concurrent readers; a view stays valid until the source is disposed.
/// </summary>
public interface IVectorSetSource
{
    int Count { get; }

    StoredVectors Get(int ordinal);
}
