namespace IndexKeeper.Tests.Crash;

/// <summary>
/// When the delay before a kill starts counting: at process start, at the first stderr line holding a
/// text (a progress phase), or once a condition on the index directory holds (polled without
/// sleeping), so a kill can aim at a step that prints nothing.
/// </summary>
internal sealed record KillTrigger(string Description, string? StderrMarker, Func<bool>? Condition)
{
    public static KillTrigger AtStart { get; } = new("start", null, null);

    public static KillTrigger OnStderr(string text) => new(text, text, null);

    public static KillTrigger When(string description, Func<bool> condition) => new(description, null, condition);
}
