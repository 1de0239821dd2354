namespace IndexKeeper.Core.Documents;

/// <summary>A document that cannot be read, with the reason it will be quarantined under.</summary>
public sealed class DocumentReadException : Exception
{
    public DocumentReadException(QuarantineReason reason, string message, Exception? inner = null)
        : base(message, inner) => Reason = reason;

    public QuarantineReason Reason { get; }
}
