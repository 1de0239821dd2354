namespace IndexKeeper.Service.Planning;

/// <summary>The cost of the work in one top-level folder of one root (folder empty: files directly in the root).</summary>
public sealed class PlanBreakdownRow
{
    public string Root { get; init; } = string.Empty;

    public string Folder { get; init; } = string.Empty;

    public long DocumentsNew { get; set; }

    public long DocumentsChanged { get; set; }

    public long DocumentsCopied { get; set; }

    public long DocumentsDeleted { get; set; }

    public long PagesToEmbed { get; set; }

    public long PagesFree { get; set; }

    public double? EstimatedEncoderSeconds { get; set; }
}
