using IndexKeeper.Core.Queue;

namespace IndexKeeper.Core.Scheduling;

/// <summary>
/// What the encoder may do now: embed up to <see cref="PagesAllowed"/> queued pages of the listed
/// priorities (in priority order), start no batch at or after <see cref="Until"/>, and, if nothing else
/// happens (no new work), ask again at <see cref="LookAgainAt"/>.
/// </summary>
public sealed record GateDecision(
    GateMode Mode,
    IReadOnlyList<QueuePriority> Priorities,
    long PagesAllowed,
    DateTimeOffset Until,
    DateTimeOffset LookAgainAt);
