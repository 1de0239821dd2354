using IndexKeeper.Core.Search;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Planning;
using IndexKeeper.Tests.Drift;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Planning;

/// <summary>
/// <c>plan</c> shows the serving view's retraining (docs/plan.md; docs/search.md, "Retraining"): due once enough
/// of the view's vectors came after training, with its estimated cost and the instant it starts in the windows —
/// on a moved clock, the next window's opening from the daytime and at once inside a night window.
/// 2026-12-02 is a Wednesday (ISO 8601 calendar).
/// </summary>
public sealed class PlanRetrainingTests : IDisposable
{
    private readonly TempDirectory temp = new();

    public void Dispose() => temp.Dispose();

    [Fact]
    public void A_due_retraining_waits_for_the_window_and_runs_at_once_inside_it()
    {
        using var session = Open(candidates: "centroids");
        for (var i = 0; i < 12; i++)
        {
            DriftIndex.AddDocument(session.Index.Catalog, $"reports/gate-{i}.pdf", $"inspection of sluice gate {i} at Harrowmere weir");
        }

        DriftIndex.Embed(session);
        var encoderId = session.Index.Encoder.Identity.Id;
        session.Index.Serving.For(encoderId, CancellationToken.None);
        var plan = session.Get<PlanOperation>();

        var quiet = plan.Build(new PlanRequest(Wednesday(12), [], Calibrate: false), CancellationToken.None).Retraining;
        Assert.NotNull(quiet);
        Assert.False(quiet.Due);
        Assert.Equal(0.0, quiet.AddedShareSinceTraining);

        // Eight more documents after training: 8 of 20 pages' vectors, past Query:RetrainAfterAddedShare = 0.3.
        for (var i = 12; i < 20; i++)
        {
            DriftIndex.AddDocument(session.Index.Catalog, $"reports/gate-{i}.pdf", $"inspection of sluice gate {i} at Harrowmere weir");
        }

        DriftIndex.Embed(session);
        session.Index.Serving.For(encoderId, CancellationToken.None);

        var daytime = plan.Build(new PlanRequest(Wednesday(12), [], Calibrate: false), CancellationToken.None).Retraining;
        Assert.NotNull(daytime);
        Assert.True(daytime.Due, daytime.Reason);
        Assert.Equal(RetrainingDecision.AddedShareTrigger, daytime.Trigger);
        Assert.Equal(20, daytime.Pages);
        Assert.True(daytime.EstimatedCpuSeconds > 0);
        Assert.Equal(Wednesday(19), daytime.StartsAt);

        var night = plan.Build(new PlanRequest(Wednesday(21), [], Calibrate: false), CancellationToken.None).Retraining;
        Assert.Equal(Wednesday(21), night!.StartsAt);

        // Tried an hour ago (the daemon's attempt): not again within a day.
        var tried = plan.Build(new PlanRequest(Wednesday(21), [], Calibrate: false) { RetrainingTriedAt = Wednesday(20) }, CancellationToken.None).Retraining;
        Assert.False(tried!.Due);
        Assert.Null(tried.StartsAt);
    }

    [Fact]
    public void Without_centroid_lists_the_plan_has_no_retraining()
    {
        using var session = Open(candidates: "all");
        Assert.Null(session.Get<PlanOperation>().Build(new PlanRequest(Wednesday(12), [], Calibrate: false), CancellationToken.None).Retraining);
    }

    private static DateTimeOffset Wednesday(int hour) => new(2026, 12, 2, hour, 0, 0, TimeSpan.Zero);

    private IndexComposition Open(string candidates) => IndexComposition.Open(
        new IndexKeeperOptions
        {
            IndexDirectory = temp.Combine("index"),
            Roots = [new RootOptions { Name = "store", Path = Directory.CreateDirectory(temp.Combine("store")).FullName }],
            Encoder = new EncoderOptions { Name = "hashed-terms", Dimensions = 128 },
            Query = new QueryOptions { Candidates = candidates, RetrainAfterAddedShare = 0.3 },
            Schedule = new ScheduleOptions { TimeZone = "UTC", Windows = ["Mon-Fri 19:00-07:00"] },
        },
        "plan retraining test");
}
