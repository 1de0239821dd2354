namespace IndexKeeper.Demo;

/// <summary>The kinds of installation the demo documents describe; each has its own vocabulary.</summary>
internal enum DemoTopic
{
    PumpStation,
    Chlorination,
    Valves,
    Reservoir,
}
