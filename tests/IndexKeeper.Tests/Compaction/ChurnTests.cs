using IndexKeeper.Core.Compaction;
using Xunit.Abstractions;

namespace IndexKeeper.Tests.Compaction;

public sealed class ChurnTests(ITestOutputHelper output)
{
    [Theory]
    [InlineData(0.10, 1)]
    [InlineData(0.10, 2)]
    [InlineData(0.30, 3)]
    [InlineData(0.02, 4)]
    public void Default_policy_keeps_space_amplification_at_most_1_3_under_steady_churn(double churnShare, int seed)
    {
        // Our own goal (issue 3): bytes on disk / live bytes ≤ 1.3 after each compaction.
        var options = new CompactionOptions();
        var simulation = new ChurnSimulation(options, sealAtBytes: 256L * 1024 * 1024, seed);
        simulation.Ingest(10_000);
        simulation.Compact();
        var worst = 0.0;
        for (var round = 0; round < 40; round++)
        {
            simulation.ChurnRound(churnShare);
            simulation.Compact();
            worst = Math.Max(worst, simulation.SpaceAmplification);
        }

        output.WriteLine($"churn {churnShare:P0}/round: worst space amplification {worst:F3}, write amplification {simulation.WriteAmplification:F3}");
        Assert.InRange(worst, 1.0, 1.3);
        // Each rewrite copies at most 1 − t of a segment to free at least t (docs/compaction.md).
        var t = options.DeadShareThreshold;
        Assert.InRange(simulation.WriteAmplification, 1.0, 1 + ((1 - t) / t));
    }
}
