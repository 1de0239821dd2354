namespace IndexKeeper.Core.Catalog;

/// <summary>Names and version of the catalog schema; see docs/catalog.md. Values reach disk: never change them.</summary>
public static class CatalogSchema
{
    /// <summary>The schema this build reads and writes (docs/catalog.md, "Version").</summary>
    /// <summary>
    /// Version 2 keeps page words in the page-word store instead of the page records; a version-1 catalog is
    /// raised to 2 by its first writing open (no record rewritten: its pages keep their words where they are
    /// and are read there), so a build that knows only version 1 refuses it rather than miss new pages' words.
    /// </summary>
    public const int Version = 2;

    public const string FileName = "catalog.db";

    /// <summary>A new catalog while it is made whole, before it is renamed to <see cref="FileName"/>; holds no data but the empty schema.</summary>
    public const string CreatingFileName = "catalog.creating.db";

    /// <summary>LiteDB's write-ahead log beside <see cref="FileName"/> (LiteDB names it, not we).</summary>
    public const string LogFileName = "catalog-log.db";
    public const string Meta = "meta";
    public const string Documents = "documents";
    public const string Pages = "pages";
    public const string Queue = "queue";
    public const string Scans = "scans";
    public const string Encoders = "encoders";
    public const string Segments = "segments";
    public const string VectorSets = "vectorSets";
    internal const string SegmentCounterMetaId = "segmentCounter";
    internal const string SchemaMetaId = "schema";
    internal const string ServingEncoderMetaId = "servingEncoder";
    internal const string RetiredSegmentsMetaId = "retiredSegments";
    internal const string VectorSetGenerationMetaId = "vectorSetGeneration";
}
