namespace IndexKeeper.Service.WorkQueue;

/// <summary>A job a worker holds under its lease; <see cref="TakenOver"/> when an earlier holder's lease had expired.</summary>
internal sealed record ClaimedJob(PageJob Job, bool TakenOver);
