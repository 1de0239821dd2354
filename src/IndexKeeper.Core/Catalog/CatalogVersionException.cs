namespace IndexKeeper.Core.Catalog;

/// <summary>The catalog was written by a schema this build does not know; nothing was changed.</summary>
public sealed class CatalogVersionException : Exception
{
    public CatalogVersionException(string message)
        : base(message)
    {
    }
}
