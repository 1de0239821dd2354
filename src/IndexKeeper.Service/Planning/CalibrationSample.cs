using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Service.Planning;

/// <summary>
/// Which pages <c>plan --calibrate</c> times (docs/plan.md, "Calibration"), a pure rule: every document kind
/// present gets pages (at least <see cref="MinPerKind"/>, more in proportion to its share of the pages),
/// picked at evenly spaced ranks of its pages ordered by size (words), so short and long pages of each kind
/// are both timed; each kind's time per page is then weighted by its share of all the pages (a stratified
/// estimate, so a rare kind sampled heavily does not skew the mean).
/// </summary>
public static class CalibrationSample
{
    /// <summary>Pages timed in all, before the per-kind minimum is added.</summary>
    public const int Target = 48;

    public const int MinPerKind = 4;

    /// <param name="size">A page's size for ordering within its kind (its word count).</param>
    public static IReadOnlyList<CalibrationStratum> Choose(IReadOnlyList<PreviewSampleStratum> strata, Func<PageRecord, long> size)
    {
        ArgumentNullException.ThrowIfNull(strata);
        ArgumentNullException.ThrowIfNull(size);
        var total = strata.Sum(s => s.Pages);
        if (total == 0)
        {
            return [];
        }

        var chosen = new List<CalibrationStratum>();
        foreach (var stratum in strata.Where(s => s.Sample.Count > 0))
        {
            var share = (double)stratum.Pages / total;
            var wanted = Math.Min(Math.Max((int)Math.Round(Target * share), MinPerKind), stratum.Sample.Count);
            var ordered = stratum.Sample.OrderBy(size).ThenBy(p => p.Id, StringComparer.Ordinal).ToList();
            var picked = Enumerable.Range(0, wanted).Select(i => ordered[(int)((i + 0.5) * ordered.Count / wanted)]).ToList();
            chosen.Add(new CalibrationStratum(stratum.Kind, share, picked));
        }

        return chosen;
    }
}
