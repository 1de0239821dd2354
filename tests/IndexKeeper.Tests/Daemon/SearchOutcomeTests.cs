using System.Diagnostics.Metrics;
using IndexKeeper.Core.Health;
using IndexKeeper.Service.Daemon;
using Microsoft.AspNetCore.Http;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// A search its client abandons counts as cancelled, apart from failures, so it cannot feed the
/// searches-failing alert (config/prometheus/indexkeeper-alerts.yml, tested by promtool).
/// </summary>
public sealed class SearchOutcomeTests
{
    [Fact]
    public void A_search_stopped_by_the_client_going_away_is_cancelled_and_one_that_throws_is_failed()
    {
        using var tally = new SearchTally();
        using var aborted = new CancellationTokenSource();
        aborted.Cancel();

        Assert.Throws<OperationCanceledException>(() => tally.Metrics.TimeSearch(() => throw new OperationCanceledException(aborted.Token), aborted.Token));
        Assert.Throws<InvalidOperationException>(() => tally.Metrics.TimeSearch(() => throw new InvalidOperationException("segment unreadable"), CancellationToken.None));

        // A cancellation the client did not ask for (the daemon stopping a search of its own) is a failure.
        Assert.Throws<OperationCanceledException>(() => tally.Metrics.TimeSearch(() => throw new OperationCanceledException(), CancellationToken.None));
        tally.Metrics.TimeSearch(() => Results.Ok(), CancellationToken.None);
        tally.Metrics.TimeSearch(() => Results.BadRequest(), CancellationToken.None);

        var counts = tally.Read();
        Assert.Equal(1, counts["cancelled"]);
        Assert.Equal(2, counts["failed"]);
        Assert.Equal(1, counts["answered"]);
        Assert.Equal(1, counts["refused"]);
    }

    /// <summary>
    /// Reads the search counter of one <see cref="DaemonMetrics"/>: the one whose instruments were published on
    /// this thread while it was built (tests in parallel build their own on other threads).
    /// </summary>
    private sealed class SearchTally : IDisposable
    {
        private readonly MeterListener listener = new();
        private readonly Dictionary<string, long> counts = new(StringComparer.Ordinal);
        private Instrument? requests;

        public SearchTally()
        {
            var thread = Environment.CurrentManagedThreadId;
            listener.InstrumentPublished = (instrument, l) =>
            {
                if (instrument.Name == "indexkeeper.search.requests" && Environment.CurrentManagedThreadId == thread && requests is null)
                {
                    requests = instrument;
                    l.EnableMeasurementEvents(instrument);
                }
            };
            listener.SetMeasurementEventCallback<long>((instrument, value, tags, _) =>
            {
                if (ReferenceEquals(instrument, requests))
                {
                    foreach (var tag in tags)
                    {
                        counts[(string)tag.Value!] = value;
                    }
                }
            });
            listener.Start();
            Metrics = new DaemonMetrics(new DaemonState(TimeProvider.System, 16), new HealthLimits(TimeSpan.FromHours(1), 0.5, 0.05, TimeSpan.FromMinutes(10)));
        }

        public DaemonMetrics Metrics { get; }

        public IReadOnlyDictionary<string, long> Read()
        {
            listener.RecordObservableInstruments();
            return counts;
        }

        public void Dispose()
        {
            listener.Dispose();
            Metrics.Dispose();
        }
    }
}
