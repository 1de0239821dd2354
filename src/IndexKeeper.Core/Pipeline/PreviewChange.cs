namespace IndexKeeper.Core.Pipeline;

/// <summary>One document a dry-run pass would change.</summary>
/// <param name="PagesToEmbed">Its pages whose keys the index has never seen (first occurrence in the pass only).</param>
/// <param name="PagesFree">Its pages whose keys already exist: moved, copied or unchanged pages cost no encoder call.</param>
public sealed record PreviewChange(string Root, string Path, ChangeKind Kind, int PagesToEmbed, int PagesFree);
