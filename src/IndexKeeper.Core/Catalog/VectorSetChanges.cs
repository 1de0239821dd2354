namespace IndexKeeper.Core.Catalog;

/// <summary>
/// The vector sets one committed transaction touched, as it left them (a deleted one reads as not live), and
/// the vector-set generation that commit made. A serving view applies these instead of reading the directory again.
/// </summary>
public sealed record VectorSetChanges(long Generation, IReadOnlyList<VectorSetRecord> Changed);
