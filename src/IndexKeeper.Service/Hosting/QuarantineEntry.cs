namespace IndexKeeper.Service.Hosting;

/// <summary>One quarantined document: where, why, and since when. It is retried when the file changes.</summary>
public sealed record QuarantineEntry(string Root, string Path, string Reason, string Message, DateTime SinceUtc);
