namespace IndexKeeper.Core.Catalog;

/// <summary>Another process holds the index; the message names it.</summary>
public sealed class IndexLockedException : Exception
{
    public IndexLockedException(string message, int? holderProcessId)
        : base(message) => HolderProcessId = holderProcessId;

    public int? HolderProcessId { get; }
}
