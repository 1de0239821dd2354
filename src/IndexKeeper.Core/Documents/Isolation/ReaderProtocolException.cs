namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>The other side of the worker pipe sent bytes that are not a valid frame or body.</summary>
internal sealed class ReaderProtocolException(string message) : Exception(message);
