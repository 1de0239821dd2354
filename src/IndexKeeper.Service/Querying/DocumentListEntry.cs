using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Service.Querying;

/// <summary>One document as the API lists it.</summary>
public sealed record DocumentListEntry(string Root, string Path, DocumentState State, DocumentKind Kind, int Pages, long Size, DateTime LastChangedUtc, string? Quarantine);
