namespace IndexKeeper.Core.Catalog;

/// <summary>
/// One finished scan pass (collection <c>scans</c>): when, and what it found; or, with
/// <see cref="Command"/> <c>embed</c>, one embed run: pages and vectors made and encoder seconds spent.
/// </summary>
public sealed class ScanRecord
{
    /// <summary>The <see cref="Counts"/> key of files a pass's globs left out. Reaches the catalog: never change it.</summary>
    public const string FilesSkippedByPatternKey = "filesSkippedByPattern";

    /// <summary>The <see cref="Counts"/> key of files of a type no reader takes. Reaches the catalog: never change it.</summary>
    public const string FilesUnsupportedKey = "filesUnsupported";

    /// <summary>Milliseconds inside the reader (parsing, conversion, OCR) during the pass.</summary>
    public const string ReadMillisecondsKey = "readMilliseconds";

    public int Id { get; set; }

    public DateTime StartedUtc { get; set; }

    public double ElapsedSeconds { get; set; }

    public string Command { get; set; } = string.Empty;

    public Dictionary<string, long> Counts { get; set; } = [];

    /// <summary>Files of types no reader takes that the pass walked past, by type (scan records).</summary>
    public List<TypeCount> UnsupportedTypes { get; set; } = [];

    /// <summary>The encoder of an embed record; empty for a scan.</summary>
    public string EncoderId { get; set; } = string.Empty;

    /// <summary>Wall time inside encoder calls (embed records).</summary>
    public double EncoderSeconds { get; set; }
}
