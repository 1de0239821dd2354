using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Search;

/// <summary>One live page of a serving view: its key, where its vector set lies and how many vectors it has.</summary>
public readonly record struct ServingEntry(PageKey Key, RecordLocation Location, int VectorCount);
