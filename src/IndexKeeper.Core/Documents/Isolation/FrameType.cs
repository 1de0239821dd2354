namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>Frame types of the reader-worker protocol. Numbers go over the wire: never change them.</summary>
internal enum FrameType : byte
{
    /// <summary>Worker to supervisor, once at start: the protocol version.</summary>
    Hello = 1,

    /// <summary>Supervisor to worker: a path and the read limits.</summary>
    ReadRequest = 2,

    /// <summary>Worker to supervisor: the document's kind and pages.</summary>
    Content = 3,

    /// <summary>Worker to supervisor: the document cannot be read; a quarantine reason and a message.</summary>
    Refusal = 4,

    /// <summary>Worker to supervisor: the reader failed unexpectedly (a bug); exception type and message.</summary>
    Fault = 5,
}
