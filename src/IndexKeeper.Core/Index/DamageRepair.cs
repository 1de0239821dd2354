using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Index;

/// <summary>
/// The explicit repair of what <see cref="DamageSurvey"/> found (the <c>repair</c> command; never run by a
/// read): vector sets whose bytes cannot be read are forgotten and their pages queued again; a file that is
/// missing or whose header is bad leaves the catalog (a bad file is moved to <c>segments/damaged/</c>, never
/// deleted); a bad seal over good records is written again. Returns one line per change, naming what was dropped.
/// </summary>
/// <remarks>REQUIRES: the index lock is held and the catalog is open for writing.</remarks>
public static class DamageRepair
{
    public const string DamagedFolder = "damaged";

    public static IReadOnlyList<string> Run(IndexCatalog catalog, string segmentsDirectory, DamageReport damage)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(damage);
        var done = new List<string>();
        foreach (var segment in damage.Segments)
        {
            var path = SegmentFileNames.PathOf(segmentsDirectory, segment.SegmentId);
            var wholeFile = segment.FileProblem is not null;
            if (segment.VectorSetsUnreadable.Count > 0 || wholeFile)
            {
                var lost = segment.VectorSetsUnreadable
                    .Select(u => catalog.VectorSets.Find(u.EncoderId, u.PageKey))
                    .OfType<VectorSetRecord>()
                    .Where(v => v.SegmentId == segment.SegmentId)
                    .ToList();
                var requeued = catalog.ForgetVectorSets(lost, wholeFile ? [segment.SegmentId] : []);
                var pages = segment.Pages.Count == 0 ? string.Empty : $" (pages {string.Join(", ", segment.Pages.Select(p => p[..12] + "…"))})";
                done.Add($"segment {segment.SegmentId}: dropped {lost.Count} unreadable vector set(s){pages}, {requeued} page(s) queued again");
            }

            if (wholeFile && !segment.Missing && File.Exists(path))
            {
                var folder = Path.Combine(segmentsDirectory, DamagedFolder);
                Directory.CreateDirectory(folder);
                var target = Path.Combine(folder, segment.File + "." + DateTime.UtcNow.ToString("yyyyMMddHHmmss", System.Globalization.CultureInfo.InvariantCulture));
                File.Move(path, target);
                done.Add($"segment {segment.SegmentId}: its file moved to {DamagedFolder}/{Path.GetFileName(target)} and left the catalog");
            }
            else if (wholeFile)
            {
                done.Add($"segment {segment.SegmentId}: its missing file left the catalog");
            }
            else if (segment.SealProblem is not null)
            {
                var refused = SegmentResealer.Reseal(path);
                done.Add(refused is null
                    ? $"segment {segment.SegmentId}: re-sealed (its records were intact; nothing dropped)"
                    : $"segment {segment.SegmentId}: not re-sealed, {refused}");
            }
        }

        return done;
    }
}
