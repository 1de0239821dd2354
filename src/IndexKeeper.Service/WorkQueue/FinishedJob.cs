namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// A job a worker handed back: done with the encoder id it encoded with and the vector set's wire bytes
/// (<see cref="VectorSetWire"/>), or failed with a kind and a reason. The bytes lie in <see cref="JobTable"/>'s reused
/// buffer: valid until its next <see cref="JobTable.Finished"/>.
/// </summary>
internal sealed record FinishedJob(PageJob Job, JobState State, string? Worker, string? ResultEncoderId, ReadOnlyMemory<byte>? Result, JobFailure? Failure, string? Reason);
