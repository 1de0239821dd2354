namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// One look at the handed-back jobs (<see cref="JobTable.Finished"/>): those taken for a commit (none while they are
/// still gathering), and, taken or not, how many were back and how long the oldest had waited, on the database's clock.
/// </summary>
internal sealed record FinishedLook(IReadOnlyList<FinishedJob> Taken, long Back, TimeSpan Oldest);
