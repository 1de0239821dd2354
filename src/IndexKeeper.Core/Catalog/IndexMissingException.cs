namespace IndexKeeper.Core.Catalog;

/// <summary>A command that needs an existing index found none at the path; nothing was created.</summary>
public sealed class IndexMissingException : Exception
{
    public IndexMissingException(string message)
        : base(message)
    {
    }
}
