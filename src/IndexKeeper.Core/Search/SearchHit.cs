using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Search;

/// <summary>One page found: its ordinal in the source, its key, its MaxSim score and the match map.</summary>
/// <param name="Matches">One entry per query token, in query order: the page vector that matched it best.</param>
public sealed record SearchHit(int Ordinal, PageKey Key, float Score, IReadOnlyList<TokenMatch> Matches);
