using IndexKeeper.Tests.WorkQueue;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// The coordinator's CPU per page over the work queue, stage by stage, in this process
/// (<see cref="CoordinatorProfile"/>): what <c>workqueue</c> measures as a whole, taken apart, on the demo store.
/// </summary>
public sealed class CoordinatorBenchmark : IBenchmark
{
    public string Name => "workqueue-coordinator";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var store = Path.Combine(context.WorkDirectory, "store");
        var roots = context.Quick ? EmbedBenchmark.SmokeStore(store) : EmbedBenchmark.DemoRoots(context, store);
        using var server = new PostgresServer();

        // The first run pays the JIT compilation of every stage (Npgsql, LiteDB, the codecs): reported apart, so the
        // runs after it measure the stages alone, as a long-running coordinator pays them.
        CoordinatorProfile.Run(context, server, roots, Path.Combine(context.WorkDirectory, "profile-first"), label: "first run, JIT included");

        // As results trickle in through the daemon: one worker's hand-back (Queue:ClaimBatch, 8) a commit.
        CoordinatorProfile.Run(context, server, roots, Path.Combine(context.WorkDirectory, "profile-8"), commitBatch: 8, label: "commits of 8");
        CoordinatorProfile.Run(context, server, roots, Path.Combine(context.WorkDirectory, "profile"));
    }
}
