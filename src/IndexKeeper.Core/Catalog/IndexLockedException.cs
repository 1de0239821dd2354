namespace IndexKeeper.Core.Catalog;

/// <summary>Another process holds the index; the message names it.</summary>
public sealed class IndexLockedException : Exception
{
    public IndexLockedException(string message, int? holderProcessId, string? holderPurpose = null)
        : base(message)
    {
        HolderProcessId = holderProcessId;
        HolderPurpose = holderPurpose;
    }

    public int? HolderProcessId { get; }

    /// <summary>What the holder said it opened the index for (e.g. <c>indexkeeper run</c>), when its owner file could be read.</summary>
    public string? HolderPurpose { get; }
}
