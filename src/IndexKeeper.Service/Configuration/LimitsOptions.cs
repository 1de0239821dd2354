namespace IndexKeeper.Service.Configuration;

/// <summary>Bounds on what one document may cost the reader; a document past any of them is quarantined.</summary>
public sealed class LimitsOptions
{
    public long MaxFileMegabytes { get; set; } = 512;

    public int MaxPages { get; set; } = 5000;

    /// <summary>Cap on the decoded size of any one stream inside a document (inflate bombs).</summary>
    public long MaxDecodedStreamMegabytes { get; set; } = 256;

    /// <summary>Watchdog per document read.</summary>
    public double ReadTimeoutSeconds { get; set; } = 60;

    /// <summary>Heap limit of the reader worker process.</summary>
    public long WorkerMemoryMegabytes { get; set; } = 2048;
}
