namespace IndexKeeper.Service.Configuration;

/// <summary>How files are noticed.</summary>
public sealed class DetectOptions
{
    /// <summary>
    /// A file is read only after it has been quiet this long (copies onto shared drives arrive in pieces).
    /// A scan waits at most this long once, at its end, for files that were still being written.
    /// </summary>
    public double SettleSeconds { get; set; } = 2;
}
