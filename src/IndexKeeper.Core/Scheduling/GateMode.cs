namespace IndexKeeper.Core.Scheduling;

/// <summary>Why the gate decided as it did.</summary>
public enum GateMode
{
    /// <summary>Inside a window: every priority at full speed until the window closes.</summary>
    Window,

    /// <summary>Outside windows with budget left: fresh pages only, up to what is left.</summary>
    Budget,

    /// <summary>Nothing may run now: no work that is allowed, or the budget is spent.</summary>
    Waiting,
}
