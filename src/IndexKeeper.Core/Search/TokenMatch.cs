using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Search;

/// <summary>Where one query token matched a page: the page vector with the highest dot product, and its region.</summary>
public readonly record struct TokenMatch(int VectorIndex, float Similarity, PageBox Region);
