namespace IndexKeeper.Service.Daemon;

/// <summary>A page the encoder kept failing on: its key, one place it is seen, attempts and the last error.</summary>
public sealed record QuarantinedPage(string PageKey, string Root, string Path, int Page, int Attempts, string Reason, DateTime SinceUtc);
