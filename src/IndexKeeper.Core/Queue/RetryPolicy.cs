namespace IndexKeeper.Core.Queue;

/// <summary>
/// When a page whose encoder attempt failed may be tried again: exponential back-off from
/// <see cref="BaseDelay"/>, doubling per failure up to <see cref="MaxDelay"/>; after <see cref="MaxAttempts"/>
/// failures the page is quarantined (it stays out of the queue's way until its document changes).
/// Pure: no clock, no catalog.
/// </summary>
public sealed record RetryPolicy(int MaxAttempts, TimeSpan BaseDelay, TimeSpan MaxDelay)
{
    /// <summary>What <c>sync</c> used before the daemon: five attempts, five minutes apart at first.</summary>
    public static RetryPolicy Default { get; } = new(5, TimeSpan.FromMinutes(5), TimeSpan.FromHours(1));

    /// <summary>
    /// The decision after a failure that brings the page to <paramref name="attempts"/> failed attempts:
    /// the earliest next try, or null when the page is to be quarantined.
    /// </summary>
    public DateTime? NextTry(int attempts, DateTime nowUtc)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(attempts, 1);
        if (attempts >= MaxAttempts)
        {
            return null;
        }

        // 2^(attempts-1) × base, computed in doubles so a large count cannot overflow before the cap.
        var seconds = Math.Min(BaseDelay.TotalSeconds * Math.Pow(2, attempts - 1), MaxDelay.TotalSeconds);
        return nowUtc + TimeSpan.FromSeconds(seconds);
    }
}
