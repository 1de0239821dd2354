using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Planning;

namespace IndexKeeper.Tests.Planning;

/// <summary>
/// The rule that picks the pages <c>plan --calibrate</c> times (docs/plan.md, "Calibration"): every kind
/// present, sizes across each kind, weights by share; and the dry run's per-kind sample it draws from.
/// Stratified sampling with proportional allocation is textbook survey practice (Cochran, Sampling
/// Techniques, ch. 5; from memory); reservoir sampling is Vitter's Algorithm R (ACM TOMS 11(1), 1985).
/// </summary>
public sealed class CalibrationSampleTests
{
    [Fact]
    public void Every_kind_present_is_timed_across_its_sizes_and_weighted_by_its_share()
    {
        // A drive of long PDF pages with a few short scans and one text file: the first pages alone would be
        // one kind.
        var pdf = Stratum("pdf", 9_000, 64);
        var png = Stratum("png", 500, 30);
        var text = Stratum("text", 500, 2);

        var chosen = CalibrationSample.Choose([pdf, png, text], p => p.Words.Count);

        Assert.Equal(["pdf", "png", "text"], chosen.Select(c => c.Kind));
        Assert.Equal(1.0, chosen.Sum(c => c.Share), 9);
        Assert.Equal(0.9, chosen[0].Share, 9);

        // Proportional allocation, with a floor per kind, and never more than the kind has.
        Assert.Equal((int)Math.Round(CalibrationSample.Target * 0.9), chosen[0].Pages.Count);
        Assert.Equal(CalibrationSample.MinPerKind, chosen[1].Pages.Count);
        Assert.Equal(2, chosen[2].Pages.Count);

        // Sizes across the kind: the picks reach into the smallest and the largest tenth, each page once.
        var sizes = chosen[0].Pages.Select(p => p.Words.Count).ToList();
        Assert.True(sizes.Min() <= 6 && sizes.Max() >= 58, string.Join(", ", sizes));
        Assert.Equal(sizes.Count, chosen[0].Pages.Distinct().Count());
    }

    [Fact]
    public void Nothing_to_time_gives_no_sample()
    {
        Assert.Empty(CalibrationSample.Choose([], p => p.Words.Count));
    }

    [Fact]
    public void The_dry_run_keeps_a_bounded_uniform_sample_of_every_kind_and_counts_them_all()
    {
        var sampler = new PreviewSampler();
        var kept = new HashSet<PageKey>();
        for (var i = 0; i < 1_000; i++)
        {
            var key = PageKey.Of(BitConverter.GetBytes(i));
            kept.Add(key);
            if (sampler.Offer(i % 10 == 0 ? DocumentKind.Png : DocumentKind.Pdf, key, new PageRecord { Id = key.Hex, SourcePage = i }) is { } evicted)
            {
                Assert.True(kept.Remove(evicted));
            }
        }

        var strata = sampler.Strata(_ => true);

        Assert.Equal([("pdf", 900L), ("png", 100L)], strata.Select(s => (s.Kind, s.Pages)));
        Assert.All(strata, s => Assert.Equal(PreviewSampleStratum.SampleLimit, s.Sample.Count));
        Assert.Equal(kept.Count, strata.Sum(s => s.Sample.Count));

        // Uniform over the pass, not its first pages: the PDF sample reaches into the last half.
        Assert.Contains(strata[0].Sample, p => p.SourcePage >= 500);
    }

    private static PreviewSampleStratum Stratum(string kind, long pages, int sampled) =>
        new(kind, pages, Enumerable.Range(1, sampled)
            .Select(i => new PageRecord { Id = $"{kind}-{i:D3}", Words = Enumerable.Range(0, i).Select(_ => new WordRecord { T = "w" }).ToList() })
            .ToList());
}
