using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Search;

/// <summary>A page whose vector set became live or moved (<see cref="Location"/> given) or stopped being live (null).</summary>
public readonly record struct ServingChange(PageKey Key, RecordLocation? Location, int VectorCount);
