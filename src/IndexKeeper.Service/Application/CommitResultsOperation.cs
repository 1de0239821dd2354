using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Faults;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.WorkQueue;

namespace IndexKeeper.Service.Application;

/// <summary>
/// The coordinator's half of remote embedding that comes back: each handed-back job is judged
/// (<see cref="ResultCheck"/>: the worker's encoder id must be the job's, the job's the active one), the
/// accepted vector sets are committed through the one writer's path (<c>VectorStore.AppendAndCommit</c>:
/// bytes durable, then the catalog with the queue entries they satisfy), and failures go to the catalog's
/// queue as local ones do. Returns every job dealt with, for the caller to delete only after this commit:
/// a crash in between leaves jobs whose pages have vectors, dropped at the next look.
/// </summary>
/// <remarks>REQUIRES: the index is open for writing and this is its only writer.</remarks>
internal sealed class CommitResultsOperation(OpenIndex index, RetryPolicy retry)
{
    public CommitOutcome Run(IReadOnlyList<FinishedJob> finished, DateTime nowUtc)
    {
        ArgumentNullException.ThrowIfNull(finished);
        var catalog = index.Catalog;
        var encoder = index.Encoder.Identity;
        var commit = new List<(PageKey Key, Float16VectorSet Vectors)>();
        var outcome = new CommitOutcome();

        // The reference counts alone (reading page records with their words costs milliseconds, docs/benchmarks.md,
        // embed), and the vector sets, for the whole gathering in a few queries.
        var keys = finished.Select(f => f.Job.PageKey).ToList();
        var references = catalog.Pages.ReferencesOf(keys);
        var sets = catalog.VectorSets.Find(encoder.Id, keys);
        foreach (var job in finished)
        {
            var needs = references.GetValueOrDefault(job.Job.PageKey) > 0 && sets.GetValueOrDefault(job.Job.PageKey) is not { Live: true };
            Float16VectorSet? vectors = null;
            if (job.State == JobState.Done && job.Result is { } bytes)
            {
                try
                {
                    vectors = VectorSetWire.Read(bytes.Span);
                }
                catch (Exception ex) when (ex is FormatException or ArgumentException)
                {
                    outcome.Problems.Add($"page {job.Job.PageKey[..12]} from worker {job.Worker}: {ex.Message}");
                }
            }

            var (verdict, reason) = ResultCheck.Decide(job, encoder.Id, encoder.Dimensions, needs, vectors?.Dimensions);
            switch (verdict)
            {
                case ResultVerdict.Commit:
                    commit.Add((PageKey.Parse(job.Job.PageKey), vectors!));
                    break;
                case ResultVerdict.Drop:
                    if (job.Job.EncoderId == encoder.Id && !needs)
                    {
                        catalog.Queue.Remove([job.Job.PageKey]);
                    }

                    outcome.Dropped++;
                    break;
                case ResultVerdict.Defer:
                    catalog.Queue.Defer(job.Job.PageKey, nowUtc + retry.BaseDelay);
                    outcome.Deferred++;
                    outcome.Problems.Add($"page {job.Job.PageKey[..12]} waits for the next scan: {reason}");
                    break;
                case ResultVerdict.Reject:
                    outcome.Rejected++;
                    Failed(job, "rejected: " + reason, nowUtc, outcome);
                    break;
                default:
                    Failed(job, reason, nowUtc, outcome);
                    break;
            }
        }

        if (commit.Count > 0)
        {
            index.Store.AppendAndCommit(encoder, commit);
            FaultInjection.Reach(FaultPoints.QueueCommitAfter);
        }

        outcome.Committed = commit.Count;
        outcome.CommittedPages.UnionWith(commit.Select(c => c.Key.Hex));
        outcome.Vectors = commit.Sum(c => (long)c.Vectors.Count);
        return outcome;
    }

    private void Failed(FinishedJob job, string reason, DateTime nowUtc, CommitOutcome outcome)
    {
        var attempts = index.Catalog.Queue.RecordFailure(job.Job.PageKey, a => retry.NextTry(a, nowUtc), reason, nowUtc);
        if (attempts == 0)
        {
            // No longer queued (the page left the index meanwhile): nothing to count.
            return;
        }

        outcome.Failed++;
        outcome.Problems.Add($"page {job.Job.PageKey[..12]} ({job.Job.RootName}/{job.Job.RelativePath}) failed on worker {job.Worker} (attempt {attempts}): {reason}");
    }
}
