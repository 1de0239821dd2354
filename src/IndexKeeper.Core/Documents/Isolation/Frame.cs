namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>One frame of the reader-worker protocol: its type and its body bytes.</summary>
internal readonly record struct Frame(FrameType Type, byte[] Body);
