using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Storage;

/// <summary>One good vector-set record found by a scan.</summary>
public sealed record ScannedRecord(RecordLocation Location, PageKey Key, int VectorCount);
