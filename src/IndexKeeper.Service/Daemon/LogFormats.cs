namespace IndexKeeper.Service.Daemon;

/// <summary>Which console log format the daemon writes (Daemon:LogFormat); pure.</summary>
internal static class LogFormats
{
    /// <summary>
    /// <c>auto</c> becomes <c>systemd</c> when systemd connected stderr to the journal, which it says by setting
    /// JOURNAL_STREAM (systemd.exec(5), "Environment variables in spawned processes"), and <c>text</c> otherwise.
    /// </summary>
    public static string Resolve(string setting, string? journalStream) =>
        setting == "auto" ? (string.IsNullOrEmpty(journalStream) ? "text" : "systemd") : setting;
}
