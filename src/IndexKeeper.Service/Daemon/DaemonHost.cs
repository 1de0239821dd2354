using System.Net.Sockets;
using IndexKeeper.Core.Health;
using IndexKeeper.Core.Telemetry;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Core.Queue;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.WorkQueue;
using Npgsql;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.Server.Kestrel.Core;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Logging.Console;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// <c>indexkeeper run</c>: takes the index lock, then hosts the work loop and the HTTP API on the generic
/// host, in a terminal, under systemd (Type=notify) or as a Windows service. A stop request (SIGTERM,
/// service stop, Ctrl+C) gives the work loop Daemon:ShutdownGraceSeconds to finish its unit and seal.
/// </summary>
public static class DaemonHost
{
    /// <summary>Time a client has to send a request's headers once it has begun (docs/daemon.md, "Connections").</summary>
    private static readonly TimeSpan RequestHeadersTimeout = TimeSpan.FromSeconds(10);

    public static async Task<int> RunAsync(IndexKeeperOptions options, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(options);
        ListenAddress.TryParse(options.Daemon.Listen, out var listen);
        var token = BearerTokens.Resolve(options.Daemon);

        // A queue setting PostgreSQL refuses (login, a newer schema) stops the start before the index is touched.
        using var queue = WorkQueueAtStart(options.Queue);
        using var index = OpenIndex.Open(IndexSettings.From(options), DaemonClient.LockPurpose);
        var settings = index.Settings;

        // Built and repaired before any thread can race for them.
        _ = index.Store;
        _ = index.Encoder;
        var app = Build(options, settings, index, listen!, token, queue);
        var state = app.Services.GetRequiredService<DaemonState>();
        var worker = app.Services.GetRequiredService<IndexWorker>();
        var lifetime = app.Services.GetRequiredService<IHostApplicationLifetime>();
        lifetime.ApplicationStarted.Register(() =>
        {
            var url = app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()?.Addresses.FirstOrDefault() ?? listen!.ClientUrl;
            new DaemonEndpoint(DaemonEndpoint.CurrentVersion, DaemonEndpoint.ClientUrlOf(url), Environment.ProcessId, token is not null)
                .Write(index.Directory);
            app.Logger.LogInformation("IndexKeeper is running: index {Index}, API at {Url}.", index.Directory, url);
        });
        try
        {
            await app.RunAsync(cancellationToken).ConfigureAwait(false);
        }
        catch (Exception ex) when (ex is IOException or SocketException && !lifetime.ApplicationStarted.IsCancellationRequested)
        {
            // Kestrel could not bind (port taken, address not on this machine): a setting to change.
            throw new ConfigurationException([$"Daemon:Listen: cannot listen on '{options.Daemon.Listen}': {ex.Message.TrimEnd('.')}; choose another address or port (--listen HOST:PORT)."]);
        }
        finally
        {
            DaemonEndpoint.Remove(index.Directory);

            // The index closes only after the work loop's thread has ended: never under a writer.
            if (await Task.WhenAny(worker.Completion, Task.Delay(TimeSpan.FromSeconds(options.Daemon.ShutdownGraceSeconds))).ConfigureAwait(false) != worker.Completion)
            {
                // Still writing after the grace period: exit without closing the catalog under it; the OS
                // releases the lock and the next open recovers (nothing uncommitted is visible).
                Environment.Exit(1);
            }

            await app.DisposeAsync().ConfigureAwait(false);
        }

        return state.HasWorkLoopFailed ? 1 : 0;
    }

    /// <summary>
    /// The work queue's database, checked: null without Queue:Connection. Out of reach now is no reason to stop
    /// (the loop reconnects and says so in health); a refused login or a newer schema is (exit 2).
    /// </summary>
    private static NpgsqlDataSource? WorkQueueAtStart(QueueOptions queue)
    {
        if (string.IsNullOrWhiteSpace(queue.Connection))
        {
            return null;
        }

        var database = QueueDatabase.Create(queue, "indexkeeper-coordinator");
        try
        {
            QueueDatabase.Check(database, migrate: true);
        }
        catch (Exception ex) when (QueueDatabase.IsUnreachable(ex))
        {
            // RemoteEmbedding's first turn finds it out of reach again and reports it.
        }
        catch
        {
            database.Dispose();
            throw;
        }

        return database;
    }

    private static WebApplication Build(IndexKeeperOptions options, IndexSettings settings, OpenIndex index, ListenAddress listen, string? token, NpgsqlDataSource? queue)
    {
        var daemon = options.Daemon;
        var builder = WebApplication.CreateSlimBuilder(new WebApplicationOptions { ContentRootPath = AppContext.BaseDirectory, Args = [] });

        // Settings come from IndexKeeper's own loader only; no appsettings.json or ASPNETCORE_* surprises.
        builder.Configuration.Sources.Clear();
        builder.Host.UseSystemd();
        builder.Host.UseWindowsService(o => o.ServiceName = "IndexKeeper");
        builder.Services.Configure<HostOptions>(o => o.ShutdownTimeout = TimeSpan.FromSeconds(daemon.ShutdownGraceSeconds));
        builder.WebHost.ConfigureKestrel(k =>
        {
            // Idle sockets cannot pile up (each costs a file handle the work loop needs): past the cap a
            // connection is closed on accept; an idle one is closed after Daemon:IdleTimeoutSeconds; request
            // headers must arrive within RequestHeadersTimeout. No path upgrades its connection (no WebSockets).
            k.Limits.MaxConcurrentConnections = daemon.MaxConnections;
            k.Limits.MaxConcurrentUpgradedConnections = 0;
            k.Limits.KeepAliveTimeout = TimeSpan.FromSeconds(daemon.IdleTimeoutSeconds);
            k.Limits.RequestHeadersTimeout = RequestHeadersTimeout;

            // HTTP/1.1 only: what browsers, scrapers and the commands speak over plain HTTP.
            k.Listen(listen.Address, listen.Port, o => o.Protocols = HttpProtocols.Http1);
        });

        builder.Logging.ClearProviders();
        builder.Logging.SetMinimumLevel(LogLevel.Information);
        builder.Logging.AddFilter("Microsoft", LogLevel.Warning);
        builder.Logging.AddFilter("Microsoft.Hosting.Lifetime", LogLevel.Information);

        // A start that fails (the port is taken) is one line from RunAsync, not the host's stack trace; the
        // work loop logs its own faults.
        builder.Logging.AddFilter("Microsoft.Extensions.Hosting.Internal.Host", LogLevel.Critical);
        builder.Logging.AddConsole(o => o.LogToStandardErrorThreshold = LogLevel.Trace);
        switch (LogFormats.Resolve(daemon.LogFormat, Environment.GetEnvironmentVariable("JOURNAL_STREAM")))
        {
            case "json":
                builder.Logging.AddJsonConsole(o =>
                {
                    o.UseUtcTimestamp = true;
                    o.TimestampFormat = "yyyy-MM-ddTHH:mm:ss.fffZ";
                });
                builder.Services.Configure<ConsoleLoggerOptions>(o => o.FormatterName = ConsoleFormatterNames.Json);
                break;
            case "systemd":
                // journald stamps each line and takes the level from the "<N>" prefix (sd-daemon(3)).
                builder.Logging.AddSystemdConsole();
                break;
            default:
                builder.Logging.AddSimpleConsole(o =>
                {
                    o.SingleLine = true;
                    o.UseUtcTimestamp = true;
                    o.TimestampFormat = "yyyy-MM-ddTHH:mm:ssZ ";
                });
                break;
        }

        builder.Configuration.AddInMemoryCollection(OtlpExport.StandardVariables(Environment.GetEnvironmentVariables()));
        OtlpExport.Configure(builder.Services.AddOpenTelemetry(), daemon, builder.Configuration);

        var ringCapacity = (int)Math.Clamp(TimeSpan.FromDays(1) / TimeSpan.FromSeconds(daemon.SampleSeconds), 16, 86_400);
        builder.Services.AddSingleton(options);
        builder.Services.AddIndexApplication(
            settings, index, new RetryPolicy(daemon.MaxAttempts, TimeSpan.FromSeconds(daemon.RetryBaseSeconds), TimeSpan.FromHours(1)));
        builder.Services.AddSingleton(new DaemonState(TimeProvider.System, ringCapacity));
        builder.Services.AddSingleton<IEmbedGate>(new ScheduledEmbedGate(ScheduleSetup.Gate(options.Schedule)));
        builder.Services.AddSingleton(sp => new RootWatchers(
            settings.Scan.Roots,
            TimeSpan.FromSeconds(options.Detect.SettleSeconds),
            options.Detect.MaxPendingPaths,
            options.Detect.WatcherBufferKilobytes * 1024,
            TimeSpan.FromHours(options.Detect.RootGoneGraceHours),
            sp.GetRequiredService<DaemonState>(),
            sp.GetRequiredService<ILoggerFactory>().CreateLogger("IndexKeeper.Watch")));
        builder.Services.AddSingleton(new HealthLimits(
            TimeSpan.FromMinutes(options.Detect.FullWalkMinutes), daemon.HealthDeadRatio, daemon.HealthMinFreeShare, TimeSpan.FromMinutes(daemon.HealthSearchFailureMinutes)));
        builder.Services.AddSingleton<DaemonMetrics>();
        if (queue is not null)
        {
            builder.Services.AddSingleton<PublishJobsOperation>();
            builder.Services.AddSingleton<CommitResultsOperation>();
            builder.Services.AddSingleton(sp => new RemoteEmbedding(
                options.Queue,
                queue,
                sp.GetRequiredService<PublishJobsOperation>(),
                sp.GetRequiredService<CommitResultsOperation>(),
                index,
                sp.GetRequiredService<IEmbedGate>(),
                sp.GetRequiredService<DaemonState>(),
                sp.GetRequiredService<ILoggerFactory>().CreateLogger("IndexKeeper.WorkQueue")));
        }

        ApiContract.AddTo(builder.Services);
        builder.Services.AddSingleton<IndexWorker>();
        builder.Services.AddHostedService(sp => sp.GetRequiredService<IndexWorker>());

        var app = builder.Build();

        // Instruments exist before the first scrape.
        _ = app.Services.GetRequiredService<DaemonMetrics>();
        DaemonApi.Map(app, options, app.Services.GetRequiredService<HealthLimits>(), listen, token);
        return app;
    }
}
