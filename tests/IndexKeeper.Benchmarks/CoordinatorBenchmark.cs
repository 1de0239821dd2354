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
        CoordinatorProfile.Run(context, server, roots, Path.Combine(context.WorkDirectory, "profile"));
    }
}
