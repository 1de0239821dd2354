using IndexKeeper.Core.Index;

namespace IndexKeeper.Core.Pipeline;

/// <summary>What <c>verify</c> found: problems (exit 1 when any), the damaged or missing segment files with what they cost, and what was checked.</summary>
public sealed class VerifyReport
{
    public List<string> Problems { get; } = [];

    /// <summary>Per damaged or missing segment file: the vector sets, pages and documents affected.</summary>
    public DamageReport Damage { get; set; } = new();

    public long DocumentsChecked { get; set; }

    public long PagesChecked { get; set; }

    public long VectorSetsChecked { get; set; }

    public long SegmentsChecked { get; set; }

    public bool Clean => Problems.Count == 0;
}
