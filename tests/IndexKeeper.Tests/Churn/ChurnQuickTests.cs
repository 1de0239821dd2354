using IndexKeeper.Churn;
using Xunit.Abstractions;

namespace IndexKeeper.Tests.Churn;

/// <summary>
/// The churn simulator's week in CI: a drive generated from a seed, every kind of day played once (page
/// edits saved as built and rewritten by qpdf from Debian — an independent tool that restructures a PDF
/// without changing what its pages show —, copies, renames, folder moves, page insertions and deletions,
/// a bulk drop, an encoder change), the real scan and embed passes each day. Checked against the
/// simulator's truth (which page contents each file holds, known from the generator's inputs, not from
/// the index) and against an index rebuilt from scratch at the end.
/// </summary>
public sealed class ChurnQuickTests(ITestOutputHelper output)
{
    [Fact]
    public void A_week_of_churn_misses_nothing_embeds_only_new_contents_and_equals_a_rebuild()
    {
        using var work = new Support.TempDirectory();
        var profile = ChurnProfile.Quick with { MiniLmSamplePages = 0 };
        var report = new ChurnSimulation(profile, 2026, work.Path, output.WriteLine).Run();

        Assert.Equal(profile.Days + 1, report.Days.Count);
        Assert.All(report.Days, day =>
        {
            Assert.Equal(0, day.IndexKeeper.Misses);
            Assert.Equal(0, day.IndexKeeperUnserved);
            Assert.Equal(0, day.IndexKeeper.StaleServed);
            // Each distinct page content got one page key, so at most one encoder call.
            Assert.Equal(0, day.IndexKeeperSplitContents);
            Assert.True(day.IndexKeeper.EncoderCalls <= day.NewContents, $"day {day.Day}: {day.IndexKeeper.EncoderCalls} calls for {day.NewContents} new contents");
        });

        // The encoder change re-embeds every distinct content once, under the new encoder.
        var change = report.Days.Single(d => d.Day == profile.EncoderChangeDay);
        Assert.Equal(change.DistinctContents, change.IndexKeeper.EncoderCalls);

        var rebuild = report.Rebuild;
        Assert.True(rebuild.Equal, string.Join(Environment.NewLine, rebuild.Differences));
        Assert.True(rebuild.Queries >= 100);
        Assert.Equal(rebuild.IncrementalKeys, rebuild.VectorSetsCompared);
        Assert.True(rebuild.VectorSetsCompared > 100);
    }
}
