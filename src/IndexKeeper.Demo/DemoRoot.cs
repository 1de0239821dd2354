namespace IndexKeeper.Demo;

/// <summary>A root of the demo store: its name and its absolute path on disk.</summary>
public sealed record DemoRoot(string Name, string Path);
