using IndexKeeper.Core.Search;

namespace IndexKeeper.Tests.Search;

/// <summary>The retraining decision (docs/search.md, "Retraining"), branch by branch, on plain figures.</summary>
public sealed class RetrainingDecisionTests
{
    private static readonly DateTimeOffset Now = new(2026, 12, 2, 12, 0, 0, TimeSpan.Zero);
    private static readonly RetrainingPolicy Policy = new(BelowRecall: 0.95, AfterAddedShare: 0.5);

    private static RetrainingFacts Facts(double? recall = 0.99, double? added = 0.1, DateTimeOffset? lastAttempt = null, CandidateSource source = CandidateSource.Centroids, int pages = 1000) =>
        new(source, pages, recall is { } r ? new CandidateRecall(r, 16, 7, Now.AddHours(-1)) : null, added, Now.AddDays(-30), lastAttempt);

    [Fact]
    public void A_figure_below_the_threshold_is_due_for_the_recall()
    {
        var decision = RetrainingDecision.Of(Facts(recall: 0.949), Policy, Now);
        Assert.True(decision.Due);
        Assert.Equal(RetrainingDecision.RecallTrigger, decision.Trigger);
        Assert.Contains("0.949", decision.Reason, StringComparison.Ordinal);
    }

    [Fact]
    public void A_figure_at_the_threshold_is_not_due()
    {
        Assert.False(RetrainingDecision.Of(Facts(recall: 0.95), Policy, Now).Due);
    }

    [Fact]
    public void Half_the_vectors_added_since_training_is_due_for_the_share()
    {
        var decision = RetrainingDecision.Of(Facts(added: 0.5), Policy, Now);
        Assert.True(decision.Due);
        Assert.Equal(RetrainingDecision.AddedShareTrigger, decision.Trigger);
        Assert.False(RetrainingDecision.Of(Facts(added: 0.499), Policy, Now).Due);
    }

    [Fact]
    public void The_recall_is_named_first_when_both_are_past()
    {
        Assert.Equal(RetrainingDecision.RecallTrigger, RetrainingDecision.Of(Facts(recall: 0.5, added: 0.9), Policy, Now).Trigger);
    }

    [Fact]
    public void Unknown_figures_are_never_due()
    {
        var decision = RetrainingDecision.Of(Facts(recall: null, added: null), Policy, Now);
        Assert.False(decision.Due);
        Assert.Null(decision.Trigger);
        Assert.Contains("no recall figure yet", decision.Reason, StringComparison.Ordinal);
    }

    [Fact]
    public void Zero_thresholds_switch_each_trigger_off()
    {
        var off = new RetrainingPolicy(0, 0);
        Assert.False(RetrainingDecision.Of(Facts(recall: 0.1, added: 5), off, Now).Due);
    }

    [Fact]
    public void An_attempt_is_not_repeated_within_a_day()
    {
        Assert.False(RetrainingDecision.Of(Facts(recall: 0.5, lastAttempt: Now.AddHours(-23)), Policy, Now).Due);
        Assert.True(RetrainingDecision.Of(Facts(recall: 0.5, lastAttempt: Now.AddHours(-24)), Policy, Now).Due);
    }

    [Theory]
    [InlineData(CandidateSource.All)]
    [InlineData(CandidateSource.Graph)]
    public void Candidates_without_trained_centroids_never_need_it(CandidateSource source)
    {
        Assert.False(RetrainingDecision.Of(Facts(recall: 0.1, added: 5, source: source), Policy, Now).Due);
    }

    [Fact]
    public void An_empty_view_never_needs_it()
    {
        Assert.False(RetrainingDecision.Of(Facts(recall: 0.1, added: 5, pages: 0), Policy, Now).Due);
    }
}
