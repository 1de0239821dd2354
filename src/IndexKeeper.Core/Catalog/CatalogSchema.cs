namespace IndexKeeper.Core.Catalog;

/// <summary>Names and version of the catalog schema; see docs/catalog.md. Values reach disk: never change them.</summary>
public static class CatalogSchema
{
    /// <summary>The schema this build reads and writes (docs/catalog.md, "Version").</summary>
    public const int Version = 1;

    public const string FileName = "catalog.db";
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
    internal const string VectorSetGenerationMetaId = "vectorSetGeneration";
}
