namespace IndexKeeper.Core.Catalog;

/// <summary>How many files of one type (lower-case extension, or "(none)") a pass counted.</summary>
public sealed class TypeCount
{
    public string Type { get; set; } = string.Empty;

    public long Files { get; set; }
}
