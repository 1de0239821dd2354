namespace IndexKeeper.Core.Pipeline;

/// <summary>What <c>verify</c> found: problems (exit 1 when any), what it isolated, and what was checked.</summary>
public sealed class VerifyReport
{
    public List<string> Problems { get; } = [];

    /// <summary>Repairs made when the store was opened (crash leftovers) and isolations made by the check.</summary>
    public List<string> Repairs { get; } = [];

    public long DocumentsChecked { get; set; }

    public long PagesChecked { get; set; }

    public long VectorSetsChecked { get; set; }

    public long SegmentsChecked { get; set; }

    public bool Clean => Problems.Count == 0;
}
