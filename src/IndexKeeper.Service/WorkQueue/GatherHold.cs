namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// How long the coordinator may leave the handed-back jobs alone after a look that found them still gathering
/// (docs/work-queue.md, "Gathered looks"). Each hand-back's notification would otherwise wake it for a look that
/// takes nothing: at ten workers' rate about twenty looks a commit, each a round trip and a turn of the loop. Pure.
/// </summary>
internal static class GatherHold
{
    /// <summary>
    /// Zero when nothing is back (a notification says when something is) or a commit's worth is; otherwise the time
    /// the rest of a commit's worth takes at the rate the results came back so far (<c>back</c> in <c>oldest</c>),
    /// never past the moment the oldest has waited <paramref name="gather"/>, when it is taken anyway. A commit's worth
    /// is <paramref name="limit"/> results, or all <paramref name="outstanding"/> jobs when fewer are out: once every
    /// published job is back they are taken at once, and the workers wait for that commit before more are published.
    /// </summary>
    public static TimeSpan After(FinishedLook look, int limit, int outstanding, TimeSpan gather)
    {
        ArgumentNullException.ThrowIfNull(look);
        var full = Math.Min(limit, outstanding);
        if (look.Taken.Count > 0 || look.Back <= 0 || look.Back >= full || look.Oldest <= TimeSpan.Zero)
        {
            return TimeSpan.Zero;
        }

        var untilOld = gather - look.Oldest;
        var untilFull = look.Oldest * ((full - look.Back) / (double)look.Back);
        return TimeSpan.FromTicks(Math.Max(0, Math.Min(untilOld.Ticks, untilFull.Ticks)));
    }
}
