namespace IndexKeeper.Tests.EndToEnd;

/// <summary>A fact that needs fanotify permission events (Linux, CAP_SYS_ADMIN); skipped, saying so, where they are not granted.</summary>
internal sealed class OpenGateFactAttribute : FactAttribute
{
    public OpenGateFactAttribute()
    {
        if (!OpenGate.Available)
        {
            Skip = "needs fanotify permission events (Linux, CAP_SYS_ADMIN) to change a file at the instant the reader opens it";
        }
    }
}
