namespace IndexKeeper.Churn;

/// <summary>Size of a simulated month: the first day's store, how busy a day is, and which days are special.</summary>
internal sealed record ChurnProfile(
    string Name,
    int Days,
    IReadOnlyList<int> ManualPages,
    int Decks,
    int Reports,
    int Forms,
    int Drawings,
    int Scans,
    int WorkingDayEdits,
    IReadOnlyList<int> BulkDropDays,
    IReadOnlyList<int> ReorganisationDays,
    int EncoderChangeDay,
    int MiniLmSamplePages,
    int Queries)
{
    /// <summary>A week in CI: about 150 pages at first, every kind of day at least once.</summary>
    public static ChurnProfile Quick { get; } = new("quick", 8, [20, 28, 48], 1, 3, 4, 2, 4, 2, [2], [3], 4, 3, 100);

    /// <summary>A month on an engineering drive of about 3,000 pages, manuals of 20 to 400 pages.</summary>
    public static ChurnProfile Month { get; } = new(
        "month", 30, [400, 260, 180, 140, 120, 96, 80, 64, 48, 40, 32, 24, 20], 6, 24, 40, 10, 30, 6, [4, 18], [10, 24], 16, 48, 120);

    public string DayType(int day) =>
        day == EncoderChangeDay ? "encoder change"
        : BulkDropDays.Contains(day) ? "bulk drop"
        : ReorganisationDays.Contains(day) ? "reorganisation"
        : day % 7 is 6 or 0 ? "weekend"
        : "working day";
}
