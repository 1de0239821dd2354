namespace IndexKeeper.Core.Scheduling;

/// <summary>
/// Turns a wall-clock time in a zone into one instant, with one rule for the two daylight-saving cases
/// (docs/scheduling.md): a time the clocks skip happens at the jump (the first instant after the gap);
/// a time the clocks show twice happens the first time.
/// </summary>
internal static class ZoneClock
{
    public static DateTimeOffset Resolve(TimeZoneInfo zone, DateTime local)
    {
        local = DateTime.SpecifyKind(local, DateTimeKind.Unspecified);
        if (zone.IsInvalidTime(local))
        {
            return GapEnd(zone, local);
        }

        if (zone.IsAmbiguousTime(local))
        {
            // The larger offset is the earlier instant: the first time the clocks show this reading.
            var offsets = zone.GetAmbiguousTimeOffsets(local);
            return new DateTimeOffset(local, offsets.Max());
        }

        return new DateTimeOffset(local, zone.GetUtcOffset(local));
    }

    public static DateTime LocalDate(TimeZoneInfo zone, DateTimeOffset instant) => TimeZoneInfo.ConvertTime(instant, zone).DateTime.Date;

    /// <summary>The instant of the transition that skipped <paramref name="local"/>, found to the second.</summary>
    private static DateTimeOffset GapEnd(TimeZoneInfo zone, DateTime local)
    {
        var asUtc = DateTime.SpecifyKind(local, DateTimeKind.Utc);
        var before = zone.GetUtcOffset(asUtc.AddDays(-1));
        var after = zone.GetUtcOffset(asUtc.AddDays(1));

        // Read with the new offset the instant lies before the jump; read with the old one, after it.
        var low = (asUtc - after).Ticks / TimeSpan.TicksPerSecond;
        var high = (asUtc - before).Ticks / TimeSpan.TicksPerSecond;
        while (high - low > 1)
        {
            var middle = low + ((high - low) / 2);
            if (zone.GetUtcOffset(new DateTime(middle * TimeSpan.TicksPerSecond, DateTimeKind.Utc)) == after)
            {
                high = middle;
            }
            else
            {
                low = middle;
            }
        }

        return new DateTimeOffset(high * TimeSpan.TicksPerSecond, TimeSpan.Zero).ToOffset(after);
    }
}
