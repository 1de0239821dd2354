namespace IndexKeeper.Demo;

/// <summary>
/// One planned page of a manual. What the page shows depends only on this record and the manual's spec,
/// never on the page's position, so reordering or inserting pages leaves the other pages as they were:
/// pages carry section labels ("3-2", an inserted "3-2A") as printed manuals do, not running numbers.
/// </summary>
internal sealed record ManualPage(
    string Label,
    ManualPageKind Kind,
    int Section,
    string SectionTitle,
    bool OpensSection,
    ulong Seed,
    bool Amended = false);
