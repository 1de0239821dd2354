namespace IndexKeeper.Core.Catalog;

/// <summary>The catalog file exists but cannot be read as a catalog; nothing was changed.</summary>
public sealed class CatalogDamagedException : Exception
{
    public CatalogDamagedException(string message, Exception inner)
        : base(message, inner)
    {
    }
}
