using IndexKeeper.Core.Drift;

namespace IndexKeeper.Tests.Drift;

/// <summary>The pure declared-drift decision: which pages are drifted, when the switch-over happens, what is retired.</summary>
public sealed class DriftPolicyTests
{
    private const string A = "a-old";
    private const string B = "b-new";
    private const string C = "c-newer";

    [Fact]
    public void A_new_index_is_served_by_the_active_encoder()
    {
        var decision = DriftPolicy.Decide(Facts(B, serving: null, []));
        Assert.Equal(B, decision.ServingEncoderId);
        Assert.True(decision.RecordServing);
        Assert.False(decision.SwitchOver);
        Assert.Empty(decision.DriftedPages);
        Assert.Empty(decision.RetireEncoders);
    }

    [Fact]
    public void Nothing_to_do_when_the_active_encoder_serves()
    {
        var decision = DriftPolicy.Decide(Facts(A, A, [(A, ["p1", "p2"])]));
        Assert.Equal(A, decision.ServingEncoderId);
        Assert.False(decision.RecordServing);
        Assert.False(decision.Migrating);
        Assert.Empty(decision.QueueForMigration);
    }

    [Fact]
    public void A_declared_change_drifts_exactly_the_pages_without_active_vectors_and_queues_the_unqueued_ones()
    {
        var decision = DriftPolicy.Decide(Facts(B, A, [(A, ["p3", "p1", "p2"]), (B, ["p2", "p9"])], queued: ["p3", "p9"]));
        Assert.Equal(A, decision.ServingEncoderId);
        Assert.False(decision.SwitchOver);
        Assert.Equal(["p1", "p3"], decision.DriftedPages);
        Assert.Equal(["p1"], decision.QueueForMigration);
        Assert.Equal(1, decision.MigratedPages);
        Assert.Equal(3, decision.PagesToMigrate);
        Assert.Empty(decision.RetireEncoders);
    }

    [Fact]
    public void When_every_served_page_has_active_vectors_the_active_encoder_takes_over_and_the_old_one_retires()
    {
        // p4 is a fresh page only the new encoder has: it never blocks the switch.
        var decision = DriftPolicy.Decide(Facts(B, A, [(A, ["p1", "p2"]), (B, ["p1", "p2", "p4"])]));
        Assert.True(decision.SwitchOver);
        Assert.True(decision.RecordServing);
        Assert.Equal(B, decision.ServingEncoderId);
        Assert.Equal([A], decision.RetireEncoders);
        Assert.Empty(decision.DriftedPages);
        Assert.Equal(2, decision.MigratedPages);
    }

    [Fact]
    public void A_serving_encoder_without_live_pages_is_replaced_at_once()
    {
        var decision = DriftPolicy.Decide(Facts(B, A, [(A, [])]));
        Assert.True(decision.SwitchOver);
        Assert.Equal(B, decision.ServingEncoderId);
        Assert.Equal([A], decision.RetireEncoders);
    }

    [Fact]
    public void A_second_change_during_a_migration_retires_the_half_built_encoder_and_keeps_serving_the_old_one()
    {
        var decision = DriftPolicy.Decide(Facts(C, A, [(A, ["p1", "p2"]), (B, ["p1"]), (C, ["p2"])]));
        Assert.Equal(A, decision.ServingEncoderId);
        Assert.Equal([B], decision.RetireEncoders);
        Assert.Equal(["p1"], decision.DriftedPages);
        Assert.Equal(1, decision.MigratedPages);
    }

    [Fact]
    public void Going_back_to_the_serving_encoder_retires_the_one_abandoned()
    {
        var decision = DriftPolicy.Decide(Facts(A, A, [(A, ["p1", "p2"]), (B, ["p1"])]));
        Assert.Equal([B], decision.RetireEncoders);
        Assert.False(decision.Migrating);
    }

    [Fact]
    public void Retired_encoders_are_not_retired_again()
    {
        var decision = DriftPolicy.Decide(Facts(B, B, [(A, []), (B, ["p1"])], retired: [A]));
        Assert.Empty(decision.RetireEncoders);
        Assert.False(decision.RecordServing);
    }

    [Fact]
    public void A_catalog_that_never_recorded_a_serving_encoder_is_served_by_the_one_that_made_its_vectors()
    {
        var decision = DriftPolicy.Decide(Facts(B, serving: null, [(A, ["p1", "p2"])]));
        Assert.Equal(A, decision.ServingEncoderId);
        Assert.True(decision.RecordServing);
        Assert.Equal(["p1", "p2"], decision.DriftedPages);
        Assert.Equal(["p1", "p2"], decision.QueueForMigration);
    }

    [Fact]
    public void A_catalog_that_never_recorded_one_and_has_active_vectors_is_served_by_the_active_encoder()
    {
        // As the builds before drift tracking searched: the active encoder's vectors only.
        var decision = DriftPolicy.Decide(Facts(B, serving: null, [(A, ["p1", "p2", "p3"]), (B, ["p1"])]));
        Assert.Equal(B, decision.ServingEncoderId);
        Assert.Equal([A], decision.RetireEncoders);
        Assert.Empty(decision.DriftedPages);
    }

    [Fact]
    public void Inference_prefers_the_encoder_with_most_pages_then_the_lowest_id()
    {
        Assert.Equal(C, DriftPolicy.Decide(Facts("z", null, [(A, ["p1"]), (C, ["p1", "p2"])])).ServingEncoderId);
        Assert.Equal(A, DriftPolicy.Decide(Facts("z", null, [(C, ["p1"]), (A, ["p2"])])).ServingEncoderId);
    }

    /// <summary>Every combination of three pages held by the serving and the active encoder, and queued or not.</summary>
    [Fact]
    public void Invariants_hold_for_every_combination_of_three_pages()
    {
        string[] universe = ["p1", "p2", "p3"];
        for (var servingMask = 0; servingMask < 8; servingMask++)
        {
            for (var activeMask = 0; activeMask < 8; activeMask++)
            {
                for (var queuedMask = 0; queuedMask < 8; queuedMask++)
                {
                    var served = Pick(universe, servingMask);
                    var active = Pick(universe, activeMask);
                    var queued = Pick(universe, queuedMask);
                    var d = DriftPolicy.Decide(Facts(B, A, [(A, served), (B, active)], queued: queued));
                    var case_ = $"served {servingMask}, active {activeMask}, queued {queuedMask}";

                    // Drifted and migrated pages split the served pages; no drifted page has active vectors.
                    Assert.True(d.DriftedPages.All(p => served.Contains(p) && !active.Contains(p)), case_);
                    Assert.Equal(served.Length, d.DriftedPages.Count + d.MigratedPages);

                    // Only unqueued drifted pages are queued, each once.
                    Assert.Equal(d.DriftedPages.Where(p => !queued.Contains(p)), d.QueueForMigration);

                    // The switch happens exactly when nothing is left to migrate, and then the old encoder retires.
                    Assert.Equal(d.DriftedPages.Count == 0, d.SwitchOver);
                    Assert.Equal(d.SwitchOver ? B : A, d.ServingEncoderId);
                    Assert.Equal(d.SwitchOver ? [A] : [], d.RetireEncoders);
                    Assert.Equal(d.SwitchOver, d.RecordServing);
                }
            }
        }
    }

    private static string[] Pick(string[] universe, int mask) => universe.Where((_, i) => (mask & (1 << i)) != 0).ToArray();

    private static DriftFacts Facts(
        string active,
        string? serving,
        (string Encoder, string[] Pages)[] live,
        string[]? queued = null,
        string[]? retired = null) => new(
            active,
            serving,
            live.ToDictionary(e => e.Encoder, e => (IReadOnlySet<string>)e.Pages.ToHashSet(StringComparer.Ordinal), StringComparer.Ordinal),
            (queued ?? []).ToHashSet(StringComparer.Ordinal),
            (retired ?? []).ToHashSet(StringComparer.Ordinal));
}
