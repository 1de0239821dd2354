using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.WorkQueue;
using IndexKeeper.Tests.Support;
using Npgsql;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>
/// The work queue's notifications on a real PostgreSQL (LISTEN/NOTIFY, PostgreSQL documentation "NOTIFY"): a
/// publication wakes the workers of its encoder id and no other; a hand-back or a failure wakes the coordinator;
/// a statement that changed no row sends nothing. A wake is waited for (up to a minute on a loaded machine), never timed.
/// </summary>
[Collection(PostgresCollection.Name)]
public sealed class QueueNotificationTests(PostgresServer server) : IDisposable
{
    private const string Encoder = "3333333333333333333333333333333333333333333333333333333333333333";
    private const string OtherEncoder = "4444444444444444444444444444444444444444444444444444444444444444";
    private static readonly TimeSpan Patience = TimeSpan.FromMinutes(1);

    private readonly NpgsqlDataSource database = server.CreateQueue();

    private JobTable Jobs => new(database);

    private static PageJob Job(int i, string encoder = Encoder) =>
        new(i.ToString("x64", System.Globalization.CultureInfo.InvariantCulture), encoder, "docs", $"f{i}.pdf", 1, new string('e', 64), 0);

    /// <summary>A listener on <paramref name="channel"/> once it listens (its first wake says so), with that wake consumed.</summary>
    private QueueListener Listening(string channel, Func<string, bool> accept)
    {
        var listener = new QueueListener(database, channel, accept);
        Assert.True(listener.Wake.WaitOne(Patience), "the listener did not connect");
        Assert.True(listener.Listening);
        return listener;
    }

    [Fact]
    public void Publishing_wakes_the_workers_of_its_encoder_only()
    {
        using var mine = Listening(QueueNotifications.JobsChannel, p => p == Encoder);
        using var other = Listening(QueueNotifications.JobsChannel, p => p == OtherEncoder);
        using var results = Listening(QueueNotifications.ResultsChannel, _ => true);

        Assert.Equal(2, Jobs.Publish([Job(1), Job(2)]));
        Assert.True(mine.Wake.WaitOne(Patience));

        // The other encoder's publication below is delivered after this one (one session's notifications keep their
        // order), so once it has woken its own listener, neither of the others was woken by the first.
        Assert.Equal(1, Jobs.Publish([Job(3, OtherEncoder)]));
        Assert.True(other.Wake.WaitOne(Patience));
        Assert.False(mine.Wake.WaitOne(0));
        Assert.False(results.Wake.WaitOne(0));
    }

    [Fact]
    public void A_hand_back_and_a_failure_wake_the_coordinator_and_a_hand_back_that_landed_nowhere_does_not()
    {
        Jobs.Publish([Job(1), Job(2)]);
        Assert.Equal(2, Jobs.Claim("w", Encoder, 2, TimeSpan.FromMinutes(5)).Count);
        using var results = Listening(QueueNotifications.ResultsChannel, p => p == Encoder);
        using var jobs = Listening(QueueNotifications.JobsChannel, _ => true);

        // Not this worker's claim: nothing changes and nothing is sent. The publication after it is delivered after
        // anything it sent (notifications keep their commit order), so once that has arrived, nothing had.
        Assert.Equal(0, Jobs.Finish("someone-else", [(Job(1), new byte[] { 1 })], Encoder));
        Jobs.Publish([Job(5)]);
        Assert.True(jobs.Wake.WaitOne(Patience));
        Assert.False(results.Wake.WaitOne(0));

        Assert.Equal(1, Jobs.Finish("w", [(Job(1), new byte[] { 1 })], Encoder));
        Assert.True(results.Wake.WaitOne(Patience));
        Assert.True(Jobs.Fail("w", Job(2), JobFailure.Changed, "changed"));
        Assert.True(results.Wake.WaitOne(Patience));
    }

    [Fact]
    public void Claims_given_back_at_a_stop_wake_the_other_workers()
    {
        Jobs.Publish([Job(1)]);
        Jobs.Claim("w", Encoder, 1, TimeSpan.FromMinutes(5));
        using var jobs = Listening(QueueNotifications.JobsChannel, p => p == Encoder);
        Assert.Equal(1, Jobs.Release("w"));
        Assert.True(jobs.Wake.WaitOne(Patience));
    }

    [Fact]
    public void The_channels_and_their_version_are_the_documented_ones()
    {
        var document = File.ReadAllText(Path.Combine(RepositoryRoot.Path, "docs", "work-queue.md"));
        Assert.Contains($"## Notifications (version {QueueNotifications.Version})", document, StringComparison.Ordinal);
        foreach (var channel in new[] { QueueNotifications.JobsChannel, QueueNotifications.ResultsChannel })
        {
            Assert.EndsWith($"_v{QueueNotifications.Version}", channel, StringComparison.Ordinal);
            Assert.Contains($"| `{channel}` |", document, StringComparison.Ordinal);
        }
    }

    public void Dispose() => database.Dispose();
}
