namespace IndexKeeper.Core.Detect;

/// <summary>One watched folder: a stable name (used in the catalog), its path and its glob filters.</summary>
/// <param name="Include">Globs relative to the root that a file must match (empty: the readable types, <see cref="ReadableTypes"/>).</param>
/// <param name="Exclude">Globs relative to the root that drop a file or a whole folder.</param>
public sealed record RootSpec(string Name, string Path, IReadOnlyList<string> Include, IReadOnlyList<string> Exclude);
