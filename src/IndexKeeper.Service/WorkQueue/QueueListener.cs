using Npgsql;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// Holds one connection LISTENing on a channel (<see cref="QueueNotifications"/>) and sets <see cref="Wake"/> for
/// each notification whose payload <paramref name="accept"/>s. The connection lost, it reconnects with backoff and
/// sets <see cref="Wake"/> once it listens again (what came meanwhile was not heard); <see cref="Listening"/> is
/// false meanwhile, so the waiter falls back to its quick poll.
/// </summary>
internal sealed class QueueListener : IDisposable
{
    private readonly NpgsqlDataSource database;
    private readonly string channel;
    private readonly Func<string, bool> accept;
    private readonly AutoResetEvent wake = new(false);
    private readonly CancellationTokenSource stop = new();
    private readonly Task loop;
    private volatile bool listening;

    public QueueListener(NpgsqlDataSource database, string channel, Func<string, bool> accept)
    {
        this.database = database;
        this.channel = channel;
        this.accept = accept;
        loop = Task.Run(Listen);
    }

    /// <summary>Set by a notification (auto-reset: one set wakes one wait, and one that came while nobody waited is kept).</summary>
    public WaitHandle Wake => wake;

    /// <summary>Forgets a notification nobody has waited for yet: the caller is about to look at what it would announce.</summary>
    public void Clear() => wake.Reset();

    /// <summary>True while the connection listens: notifications can arrive.</summary>
    public bool Listening => listening;

    private async Task Listen()
    {
        var backoff = TimeSpan.Zero;
        while (!stop.IsCancellationRequested)
        {
            try
            {
                await using var connection = await database.OpenConnectionAsync(stop.Token).ConfigureAwait(false);
                connection.Notification += (_, e) =>
                {
                    if (accept(e.Payload))
                    {
                        wake.Set();
                    }
                };
                await using (var command = new NpgsqlCommand($"LISTEN {channel}", connection))
                {
                    await command.ExecuteNonQueryAsync(stop.Token).ConfigureAwait(false);
                }

                listening = true;
                backoff = TimeSpan.Zero;
                wake.Set();
                while (true)
                {
                    await connection.WaitAsync(stop.Token).ConfigureAwait(false);
                }
            }
            catch (OperationCanceledException) when (stop.IsCancellationRequested)
            {
                return;
            }
            catch (Exception ex) when (QueueDatabase.IsUnreachable(ex) || ex is PostgresException)
            {
                listening = false;
                wake.Set();
                backoff = Reconnect.Next(backoff, TimeSpan.FromSeconds(30));
                try
                {
                    await Task.Delay(backoff, stop.Token).ConfigureAwait(false);
                }
                catch (OperationCanceledException)
                {
                    return;
                }
            }
        }
    }

    public void Dispose()
    {
        stop.Cancel();
        try
        {
            loop.Wait(TimeSpan.FromSeconds(5));
        }
        catch (AggregateException ex) when (ex.InnerExceptions.All(e => e is OperationCanceledException or NpgsqlException))
        {
        }

        stop.Dispose();
        wake.Dispose();
    }
}
