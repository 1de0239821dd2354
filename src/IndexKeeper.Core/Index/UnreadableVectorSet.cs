namespace IndexKeeper.Core.Index;

/// <summary>A vector set the catalog names whose bytes cannot be read, and why.</summary>
public sealed record UnreadableVectorSet(string EncoderId, string PageKey, long Offset, bool Live, string Problem);
