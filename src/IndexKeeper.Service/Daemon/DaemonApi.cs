using IndexKeeper.Core.Health;
using IndexKeeper.Core.Scheduling;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Hosting;
using IndexKeeper.Service.Planning;
using IndexKeeper.Service.Querying;
using Microsoft.OpenApi;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;

namespace IndexKeeper.Service.Daemon;

/// <summary>The daemon's HTTP paths (docs/daemon.md): metrics, health, the status page and the JSON API.</summary>
internal static class DaemonApi
{
    public static void Map(WebApplication app, IndexKeeperOptions options, HealthLimits limits, ListenAddress listen, string? token)
    {
        var services = app.Services;
        var state = services.GetRequiredService<DaemonState>();
        var gate = services.GetRequiredService<IEmbedGate>();
        var index = services.GetRequiredService<OpenIndex>();
        var status = services.GetRequiredService<StatusOperation>();
        var search = services.GetRequiredService<SearchOperation>();
        var plan = services.GetRequiredService<PlanOperation>();
        var documents = services.GetRequiredService<DocumentListOperation>();
        if (token is null)
        {
            app.Use(async (context, next) =>
            {
                // Without a token the Host header is the defence against DNS rebinding (HostHeaderRule).
                string? host = context.Request.Headers.Host;
                if (HostHeaderRule.Names(host, listen))
                {
                    await next(context).ConfigureAwait(false);
                    return;
                }

                // RFC 9112 section 3.2: a request without Host is answered 400; RFC 9110 section 15.5.20:
                // 421 for an authority this server does not answer for.
                context.Response.StatusCode = string.IsNullOrEmpty(host) ? StatusCodes.Status400BadRequest : StatusCodes.Status421MisdirectedRequest;
                await context.Response.WriteAsync("this listener answers requests for localhost and its loopback address only\n").ConfigureAwait(false);
            });
        }
        else
        {
            app.Use(async (context, next) =>
            {
                // The page itself holds no figures (it asks the API with the token the operator types in);
                // everything else needs the token.
                if (context.Request.Path == "/" || BearerTokens.Matches(context.Request.Headers.Authorization, token))
                {
                    await next(context).ConfigureAwait(false);
                    return;
                }

                context.Response.StatusCode = StatusCodes.Status401Unauthorized;
                context.Response.Headers.WWWAuthenticate = "Bearer realm=\"indexkeeper\"";
                await context.Response.WriteAsync("a bearer token is required\n").ConfigureAwait(false);
            });
        }

        app.Use(async (context, next) =>
        {
            try
            {
                await next(context).ConfigureAwait(false);
            }
            catch (Exception ex) when (ex is not OperationCanceledException && !context.Response.HasStarted)
            {
                // A failed question is the caller's answer, with its reason; the daemon goes on.
                app.Logger.LogError(ex, "{Path} failed: {Message}", context.Request.Path, ex.Message);
                context.Response.StatusCode = StatusCodes.Status500InternalServerError;
                await context.Response.WriteAsJsonAsync(new ApiError(ex.Message), ApiJson.Options).ConfigureAwait(false);
            }
        });
        app.MapPrometheusScrapingEndpoint("/metrics");
        ApiContract.Map(app);
        app.MapGet("/health", () =>
        {
            var report = HealthRules.Evaluate(state.HealthSnapshot(), limits);
            return Results.Json(report, ApiJson.Options, statusCode: report.Status == HealthStatus.Unhealthy ? 503 : 200);
        }).Produces<HealthReport>().Produces<HealthReport>(StatusCodes.Status503ServiceUnavailable);
        app.MapGet("/", () => Results.Text(StatusPageResource.Html, "text/html; charset=utf-8")).ExcludeFromDescription();
        app.MapGet("/api/status", () =>
        {
            var report = status.Read();
            report.WorkQueue = state.WorkQueue;
            return Results.Json(report, ApiJson.Options);
        }).Produces<StatusReport>().Errors();
        var calendar = ScheduleSetup.Calendar(options.Schedule);
        app.MapGet("/api/daemon", () => Results.Json(Report(options, calendar, index, state, limits), ApiJson.Options)).Produces<DaemonReport>().Errors();
        var metrics = services.GetRequiredService<DaemonMetrics>();
        app.MapGet("/api/search", (HttpContext context, CancellationToken cancellationToken) =>
            metrics.TimeSearch(() => SearchEndpoint.Answer(context.Request.Query, options.Query, search.UnknownRoot, search.Search, state, cancellationToken), cancellationToken))
            .Produces<SearchReport>().Produces<ApiError>(StatusCodes.Status400BadRequest).Errors()
            .QueryParameters(
                ("q", JsonSchemaType.String, true, "The query text, once (Query:MaxCharacters, Query:MaxTerms)."),
                ("k", JsonSchemaType.Integer, false, "Pages in the answer, 10 by default (Query:MaxResults)."),
                ("root", JsonSchemaType.String, false, "Only pages of this root; may repeat (docs/search.md, filters)."),
                ("folder", JsonSchemaType.String, false, "Only pages of documents whose path matches this glob; may repeat."),
                ("type", JsonSchemaType.String, false, "Only pages of documents of this type; may repeat."),
                ("modified-since", JsonSchemaType.String, false, "Only documents modified at or after this ISO 8601 time."),
                ("min-score", JsonSchemaType.Number, false, "Only hits scoring at least this."),
                ("offset", JsonSchemaType.Integer, false, "Hits to skip, for paging; the answer's nextOffset gives the next page."));
        app.MapGet("/api/plan", async (string? calibrate) =>
        {
            // The plan reads documents with the daemon's reader, which belongs to the work loop's thread.
            var wantCalibration = calibrate is "1" or "true";
            var workers = state.WorkQueue?.Workers;
            var report = await state.OnWorkLoop(() => plan.Build(new PlanRequest(DateTimeOffset.UtcNow, gate.Spends, wantCalibration) { Workers = workers, RetrainingTriedAt = state.Retraining?.Facts.LastAttempt }, CancellationToken.None)).ConfigureAwait(false);
            return Results.Json(report, ApiJson.Options);
        }).Produces<PlanReport>().Errors();
        app.MapGet("/api/documents", (string? root, int? skip, int? take) =>
            Results.Json(documents.List(root, Math.Max(0, skip ?? 0), Math.Clamp(take ?? 100, 1, 10_000)), ApiJson.Options)).Produces<DocumentListReport>().Errors();
    }

    /// <summary>A question that fails is answered 500 with its reason.</summary>
    private static RouteHandlerBuilder Errors(this RouteHandlerBuilder endpoint) => endpoint.Produces<ApiError>(StatusCodes.Status500InternalServerError);

    private static DaemonReport Report(IndexKeeperOptions options, WindowCalendar calendar, OpenIndex index, DaemonState state, HealthLimits limits)
    {
        var figures = state.Figures;
        var allowance = state.Allowance;
        var zone = calendar.Zone;
        DateTimeOffset? InZone(DateTimeOffset? at) => at is { } t ? TimeZoneInfo.ConvertTime(t, zone) : null;
        return new DaemonReport
        {
            Started = TimeZoneInfo.ConvertTime(state.Started, zone),
            LastFullWalk = InZone(state.LastFullWalk),
            PagesPerSecond = Math.Round(state.PagesPerSecond, 3),
            PagesEmbedded = state.PagesEmbedded,
            WatcherOverflows = state.WatcherOverflows,
            WindowOpen = allowance.WindowOpen,
            WindowEnd = InZone(allowance.WindowEnd),
            NextWindowOpens = InZone(NextOpening(calendar, state.Clock.GetUtcNow())),
            Windows = options.Schedule.EffectiveWindows,
            TimeZone = zone.HasIanaId || !TimeZoneInfo.TryConvertWindowsIdToIanaId(zone.Id, out var iana) ? zone.Id : iana,
            Migration = figures.Migration with { ExpectedFinish = InZone(figures.Migration.ExpectedFinish) },
            QueuedFresh = figures.QueuedFresh,
            QueuedMigration = figures.QueuedMigration,
            QueuedCanary = figures.QueuedCanary,
            Health = HealthRules.Evaluate(state.HealthSnapshot(), limits),
            Roots = state.Roots,
            QuarantinedPages = index.Catalog.Queue.Quarantined().Take(200).Select(q =>
            {
                var page = index.Catalog.Pages.Find(q.Id);
                return new QuarantinedPage(q.Id, page?.SourceRoot ?? string.Empty, page?.SourcePath ?? string.Empty, page?.SourcePage ?? 0, q.Attempts, q.LastError ?? string.Empty, q.QuarantinedUtc ?? q.EnqueuedUtc);
            }).ToList(),
            Samples = state.Samples.Snapshot(),
            WorkQueue = state.WorkQueue,
        };
    }

    /// <summary>The next instant a window opens: the next change when closed, the change after the current window's end when open.</summary>
    private static DateTimeOffset? NextOpening(WindowCalendar calendar, DateTimeOffset now)
    {
        var change = calendar.NextChange(now);
        if (change != DateTimeOffset.MaxValue && calendar.IsOpen(now))
        {
            change = calendar.NextChange(change);
        }

        return change == DateTimeOffset.MaxValue ? null : change;
    }
}
