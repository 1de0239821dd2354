namespace IndexKeeper.Cli.Commands;

/// <summary>What <c>forget-root</c> did, or would do without <c>--yes</c> (<paramref name="Forgotten"/> false: nothing changed).</summary>
/// <param name="Root">The root name.</param>
/// <param name="Documents">Documents under that name: removed, or that would be.</param>
/// <param name="PagesRemoved">Page keys no other document holds: removed, their vector sets dead until compaction reclaims them.</param>
/// <param name="PagesKept">Page keys documents of other roots hold too: kept, with their vectors.</param>
/// <param name="Forgotten">True when the catalog was changed.</param>
internal sealed record ForgetRootReport(string Root, long Documents, long PagesRemoved, long PagesKept, bool Forgotten);
