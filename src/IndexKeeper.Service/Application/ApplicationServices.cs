using IndexKeeper.Core.Queue;
using Microsoft.Extensions.DependencyInjection;

namespace IndexKeeper.Service.Application;

/// <summary>
/// The one wiring of the use cases, for the daemon's host container and for a command's
/// (<see cref="IndexComposition"/>): the open index and the mapped settings are given, every use case is a
/// singleton over them with its dependencies in its constructor.
/// </summary>
public static class ApplicationServices
{
    /// <param name="embedRetry">How the embed batch retries a failing page before quarantining it.</param>
    public static IServiceCollection AddIndexApplication(this IServiceCollection services, IndexSettings settings, OpenIndex index, RetryPolicy embedRetry)
    {
        ArgumentNullException.ThrowIfNull(services);
        ArgumentNullException.ThrowIfNull(settings);
        ArgumentNullException.ThrowIfNull(index);
        ArgumentNullException.ThrowIfNull(embedRetry);

        // Given as instances: the composition root opened the index and closes it after the container.
        services.AddSingleton(settings);
        services.AddSingleton(index);
        services.AddSingleton(embedRetry);
        services.AddSingleton<DriftOperation>();
        services.AddSingleton<ScanOperation>();
        services.AddSingleton<ForgetRootOperation>();
        services.AddSingleton<EmbedBatchOperation>();
        services.AddSingleton<SyncOperation>();
        services.AddSingleton<CompactOperation>();
        services.AddSingleton<VerifyOperation>();
        services.AddSingleton<CanaryOperation>();
        services.AddSingleton<PlanOperation>();
        services.AddSingleton<SearchOperation>();
        services.AddSingleton<StatusOperation>();
        services.AddSingleton<EncodersOperation>();
        services.AddSingleton<DocumentListOperation>();
        return services;
    }
}
