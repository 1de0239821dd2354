namespace IndexKeeper.Service.Daemon;

/// <summary>The body of an API answer that is not a report: 400 (a bad parameter or a cap, named) and 500 (the reason).</summary>
public sealed record ApiError(string Error);
