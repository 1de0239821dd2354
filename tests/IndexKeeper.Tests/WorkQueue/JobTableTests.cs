using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.WorkQueue;
using Npgsql;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>
/// The job statements on a real PostgreSQL: a job is claimed by one worker at a time, only by a worker of its
/// encoder id; an expired lease lets another take it over, and the first holder's late hand-back is refused.
/// Leases are made expired by claiming with a lease already over, never by waiting.
/// </summary>
[Collection(PostgresCollection.Name)]
public sealed class JobTableTests(PostgresServer server) : IDisposable
{
    private const string Encoder = "1111111111111111111111111111111111111111111111111111111111111111";
    private const string OtherEncoder = "2222222222222222222222222222222222222222222222222222222222222222";

    private readonly NpgsqlDataSource database = server.CreateQueue();

    private JobTable Jobs => new(database);

    private static PageJob Job(int i, string encoder = Encoder, int priority = 0) =>
        new(i.ToString("x64", System.Globalization.CultureInfo.InvariantCulture), encoder, "docs", $"f{i}.pdf", 1, new string('e', 64), priority);

    [Fact]
    public void Handed_back_bytes_read_through_the_reused_buffer_are_each_results_own()
    {
        // Sizes across the buffer's growth (a small result, then one larger than the buffer so far, then a small one),
        // and a second read that reuses the buffer: every result must come back byte for byte.
        var table = Jobs;
        static byte[] Bytes(int length, int seed) => Enumerable.Range(0, length).Select(i => (byte)((i * 31) + seed)).ToArray();
        var sizes = new[] { 1000, 300_000, 7 };
        table.Publish([.. Enumerable.Range(1, 4).Select(i => Job(i))]);
        var claimed = table.Claim("w", Encoder, 3, TimeSpan.FromMinutes(5));
        var sent = claimed.Select((c, i) => (c.Job, Result: Bytes(sizes[i], i))).ToList();
        Assert.Equal(3, table.Finish("w", sent, Encoder));

        var first = table.Finished(10).Taken;
        Assert.Equal(sent.Select(s => s.Result), first.OrderBy(f => f.Job.PageKey).Select(f => f.Result!.Value.ToArray()));
        table.Delete(first.Select(f => f.Job).ToList());

        var last = Assert.Single(table.Claim("w", Encoder, 1, TimeSpan.FromMinutes(5)));
        Assert.Equal(1, table.Finish("w", [(last.Job, Bytes(50, 9))], Encoder));
        Assert.Equal(Bytes(50, 9), Assert.Single(table.Finished(10).Taken).Result!.Value.ToArray());
    }

    [Fact]
    public void Publishing_twice_makes_one_job()
    {
        Assert.Equal(3, Jobs.Publish([Job(1), Job(2), Job(3)]));
        Assert.Equal(1, Jobs.Publish([Job(3), Job(4)]));
        Assert.Equal(4, Jobs.Outstanding(Encoder).Count);
    }

    [Fact]
    public void A_second_worker_takes_another_document_rather_than_the_rest_of_one_being_worked_on()
    {
        PageJob Page(string file, int number) => new(
            $"{file}-{number}".PadLeft(64, '0'), Encoder, "docs", file, number, new string('e', 64), 0);
        Jobs.Publish([.. Enumerable.Range(1, 5).Select(n => Page("a.pdf", n)), .. Enumerable.Range(1, 5).Select(n => Page("b.pdf", n))]);

        Assert.Equal([1, 2, 3], Jobs.Claim("w1", Encoder, 3, TimeSpan.FromMinutes(5)).Select(c => c.Job.PageNumber));
        var second = Jobs.Claim("w2", Encoder, 3, TimeSpan.FromMinutes(5));
        Assert.All(second, c => Assert.Equal("b.pdf", c.Job.RelativePath));

        // The first worker goes on with its own document (then, nothing else being left, the other's).
        Assert.Equal(["a.pdf", "a.pdf", "b.pdf"], Jobs.Claim("w1", Encoder, 3, TimeSpan.FromMinutes(5)).Select(c => c.Job.RelativePath));
    }

    [Fact]
    public void Concurrent_claims_never_share_a_job()
    {
        Jobs.Publish(Enumerable.Range(1, 200).Select(i => Job(i)).ToList());
        var claimed = new System.Collections.Concurrent.ConcurrentBag<string>();
        Parallel.For(0, 4, w =>
        {
            var table = new JobTable(database);
            while (table.Claim("w" + w, Encoder, 3, TimeSpan.FromMinutes(5)) is { Count: > 0 } got)
            {
                foreach (var job in got)
                {
                    claimed.Add(job.Job.PageKey);
                }
            }
        });
        Assert.Equal(200, claimed.Count);
        Assert.Equal(200, claimed.Distinct().Count());
    }

    [Fact]
    public void A_worker_of_another_encoder_claims_nothing()
    {
        Jobs.Publish([Job(1), Job(2)]);
        Assert.Empty(Jobs.Claim("other", OtherEncoder, 10, TimeSpan.FromMinutes(5)));
        Assert.Equal(2, Jobs.Claim("same", Encoder, 10, TimeSpan.FromMinutes(5)).Count);
    }

    [Fact]
    public void Higher_priority_is_claimed_first()
    {
        Jobs.Publish([Job(1, priority: 1), Job(2, priority: 0)]);
        Assert.Equal(Job(2).PageKey, Assert.Single(Jobs.Claim("w", Encoder, 1, TimeSpan.FromMinutes(5))).Job.PageKey);
    }

    [Fact]
    public void Expired_lease_is_taken_over_and_the_first_holder_cannot_hand_back()
    {
        Jobs.Publish([Job(1)]);
        var first = Assert.Single(Jobs.Claim("first", Encoder, 1, TimeSpan.FromSeconds(-1)));
        Assert.False(first.TakenOver);

        var second = Assert.Single(Jobs.Claim("second", Encoder, 1, TimeSpan.FromMinutes(5)));
        Assert.True(second.TakenOver);
        Assert.Equal(0, Jobs.Finish("first", [(first.Job, new byte[] { 1, 2, 3 })], Encoder));
        Assert.Equal(1, Jobs.Finish("second", [(second.Job, new byte[] { 4, 5, 6 })], Encoder));

        var finished = Assert.Single(Jobs.Finished(10).Taken);
        Assert.Equal("second", finished.Worker);
        Assert.Equal(new byte[] { 4, 5, 6 }, finished.Result!.Value.ToArray());
    }

    [Fact]
    public void Gathered_results_wait_for_a_full_commit_or_for_nothing_more_to_come()
    {
        Jobs.Publish([Job(1), Job(2), Job(3)]);
        var claimed = Jobs.Claim("w", Encoder, 2, TimeSpan.FromMinutes(5));
        Assert.Equal(1, Jobs.Finish("w", [(claimed[0].Job, new byte[] { 1 })], Encoder));
        var hour = TimeSpan.FromHours(1);

        // One back, more out, none old: wait, with what is back counted. A full commit's worth (here 1), or no gathering: take it.
        var gathering = Jobs.Finished(10, hour);
        Assert.Empty(gathering.Taken);
        Assert.Equal(1, gathering.Back);
        Assert.InRange(gathering.Oldest, TimeSpan.Zero, TimeSpan.FromMinutes(10));
        Assert.Single(Jobs.Finished(1, hour).Taken);
        Assert.Single(Jobs.Finished(10).Taken);

        // A result older than the gathering time is taken even with more out.
        Assert.Single(Jobs.Finished(10, TimeSpan.Zero).Taken);

        // Nothing waiting or claimed: nothing more will come, take what is there.
        Assert.Equal(1, Jobs.Finish("w", [(claimed[1].Job, new byte[] { 2 })], Encoder));
        var last = Assert.Single(Jobs.Claim("w", Encoder, 1, TimeSpan.FromMinutes(5)));
        Assert.Equal(1, Jobs.Finish("w", [(last.Job, new byte[] { 3 })], Encoder));
        Assert.Equal(3, Jobs.Finished(10, hour).Taken.Count);
    }

    [Fact]
    public void A_live_lease_is_not_taken_over()
    {
        Jobs.Publish([Job(1)]);
        Assert.Single(Jobs.Claim("first", Encoder, 1, TimeSpan.FromMinutes(5)));
        Assert.Empty(Jobs.Claim("second", Encoder, 1, TimeSpan.FromMinutes(5)));
    }

    [Fact]
    public void Withdraw_takes_back_only_unclaimed_jobs_the_budget_did_not_pay_for()
    {
        Jobs.Publish([Job(1, priority: 0), Job(2, priority: 1), Job(3, priority: 1), Job(4, priority: 0)]);
        var claimed = Assert.Single(Jobs.Claim("w", Encoder, 1, TimeSpan.FromMinutes(5)));
        Assert.Equal(Job(1).PageKey, claimed.Job.PageKey);
        Assert.Equal([Job(2).PageKey, Job(3).PageKey], Jobs.WithdrawUnpaid(Encoder, [Job(4).PageKey]).Order(StringComparer.Ordinal));
        Assert.Empty(Jobs.WithdrawUnpaid(Encoder, [Job(4).PageKey]));
        Assert.Equal(2, Jobs.Outstanding(Encoder).Count);
    }

    [Fact]
    public void A_batch_hand_back_lands_only_the_jobs_still_the_workers_own()
    {
        Jobs.Publish([Job(1), Job(2)]);
        var first = Jobs.Claim("first", Encoder, 2, TimeSpan.FromSeconds(-1));
        var taken = Assert.Single(Jobs.Claim("second", Encoder, 1, TimeSpan.FromMinutes(5)));
        Assert.Equal(1, Jobs.Finish("first", first.Select(c => (c.Job, new byte[] { 7 })).ToList(), Encoder));
        var finished = Assert.Single(Jobs.Finished(10).Taken);
        Assert.NotEqual(taken.Job.PageKey, finished.Job.PageKey);
        Assert.Equal("first", finished.Worker);
    }

    [Fact]
    public void Released_claims_are_claimable_at_once_and_deleted_jobs_are_gone()
    {
        Jobs.Publish([Job(1), Job(2)]);
        Jobs.Claim("w", Encoder, 2, TimeSpan.FromMinutes(5));
        Assert.Equal(2, Jobs.Release("w"));
        var again = Jobs.Claim("v", Encoder, 2, TimeSpan.FromMinutes(5));
        Assert.Equal(2, again.Count);
        Jobs.Delete(again.Select(c => c.Job).ToList());
        Assert.Empty(Jobs.Outstanding(Encoder));
    }

    public void Dispose() => database.Dispose();
}
