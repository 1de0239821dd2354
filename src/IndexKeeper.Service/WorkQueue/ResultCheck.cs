namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// The coordinator's decision on one handed-back job, from plain facts (pure): the job's encoder id must be
/// the active one and the worker's must equal it, the page must still need vectors, and the bytes must be a
/// vector set of the active encoder's dimensions. No vector set of another encoder reaches the index.
/// </summary>
internal static class ResultCheck
{
    /// <param name="finished">The job as read back.</param>
    /// <param name="activeEncoderId">The coordinator's active encoder.</param>
    /// <param name="activeDimensions">Its vector dimensions.</param>
    /// <param name="pageNeedsVectors">The page is still referenced and has no live vector set under the active encoder.</param>
    /// <param name="decodedDimensions">The dimensions of the decoded bytes, or null when they did not decode.</param>
    public static (ResultVerdict Verdict, string Reason) Decide(FinishedJob finished, string activeEncoderId, int activeDimensions, bool pageNeedsVectors, int? decodedDimensions)
    {
        ArgumentNullException.ThrowIfNull(finished);
        if (finished.Job.EncoderId != activeEncoderId)
        {
            return (ResultVerdict.Drop, "published for an encoder that is no longer active");
        }

        if (finished.State == JobState.Failed)
        {
            return finished.Failure is JobFailure.Changed or JobFailure.Unmapped
                ? (ResultVerdict.Defer, finished.Reason ?? "changed")
                : (ResultVerdict.Failure, finished.Reason ?? "failed on a worker");
        }

        if (finished.State != JobState.Done)
        {
            return (ResultVerdict.Drop, $"not finished ({finished.State})");
        }

        if (finished.ResultEncoderId != finished.Job.EncoderId)
        {
            return (ResultVerdict.Reject, $"worker {finished.Worker} encoded with {Short(finished.ResultEncoderId)}, the job is for {Short(finished.Job.EncoderId)}");
        }

        if (!pageNeedsVectors)
        {
            return (ResultVerdict.Drop, "the page has vectors already or is no longer referenced");
        }

        if (decodedDimensions is not { } dimensions)
        {
            return (ResultVerdict.Reject, $"worker {finished.Worker} handed back bytes that are not a vector set");
        }

        return dimensions == activeDimensions
            ? (ResultVerdict.Commit, string.Empty)
            : (ResultVerdict.Reject, $"worker {finished.Worker} handed back {dimensions} dimensions, the encoder makes {activeDimensions}");
    }

    private static string Short(string? id) => id is null ? "no encoder" : id.Length > 12 ? id[..12] : id;
}
