using IndexKeeper.Core.Queue;
using IndexKeeper.Service.Configuration;
using Microsoft.Extensions.DependencyInjection;

namespace IndexKeeper.Service.Application;

/// <summary>
/// The composition root of one command (and of tests and tools that run the index in-process): maps the
/// settings once, opens the index, wires the use cases as the daemon does (<see cref="ApplicationServices"/>),
/// and closes the index after them.
/// </summary>
public sealed class IndexComposition : IDisposable
{
    private readonly ServiceProvider services;

    private IndexComposition(OpenIndex index)
    {
        Settings = index.Settings;
        Index = index;
        services = new ServiceCollection().AddIndexApplication(Settings, index, RetryPolicy.Default).BuildServiceProvider();
    }

    public IndexSettings Settings { get; }

    public OpenIndex Index { get; }

    public static IndexComposition Open(IndexKeeperOptions options, string purpose) =>
        new(OpenIndex.Open(IndexSettings.From(options), purpose));

    /// <summary>For the commands that only read (plan, status, search, encoders, verify): catalog and segments opened read-only, beside a writer.</summary>
    public static IndexComposition OpenReadOnly(IndexKeeperOptions options) =>
        new(OpenIndex.OpenReadOnly(IndexSettings.From(options)));

    /// <summary>For <c>rebuild-catalog</c>: <paramref name="beforeCatalog"/> runs under the index lock before the catalog is opened.</summary>
    public static IndexComposition OpenForRebuild(IndexKeeperOptions options, string purpose, Action<string> beforeCatalog)
    {
        return new IndexComposition(OpenIndex.OpenForRebuild(IndexSettings.From(options), purpose, beforeCatalog));
    }

    /// <summary>The use case of type <typeparamref name="T"/>, built with its dependencies.</summary>
    public T Get<T>()
        where T : notnull => services.GetRequiredService<T>();

    public void Dispose()
    {
        services.Dispose();
        Index.Dispose();
    }
}
