namespace IndexKeeper.Benchmarks;

/// <summary>One benchmark; Program finds every implementation by reflection and runs the ones asked for.</summary>
public interface IBenchmark
{
    /// <summary>Short name used on the command line, e.g. <c>rescan</c>.</summary>
    string Name { get; }

    void Run(BenchmarkContext context);
}
