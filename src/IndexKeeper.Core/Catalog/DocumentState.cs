namespace IndexKeeper.Core.Catalog;

/// <summary>State of a document record. Numbers reach the catalog: never change them.</summary>
public enum DocumentState
{
    Live = 1,
    Quarantined = 2,
}
