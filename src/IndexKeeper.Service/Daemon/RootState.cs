namespace IndexKeeper.Service.Daemon;

/// <summary>What the daemon knows of one root right now, as the API shows it.</summary>
/// <param name="MissingSinceUtc">When the root was first found gone (an unmounted share); null while it is there.</param>
/// <param name="Watching">True while change notifications arrive for it.</param>
/// <param name="ForgetAtUtc">When its documents will be removed if it stays gone.</param>
public sealed record RootState(string Name, string Path, bool Watching, DateTimeOffset? MissingSinceUtc, DateTimeOffset? ForgetAtUtc);
