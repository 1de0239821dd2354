namespace IndexKeeper.Service;

/// <summary>Marker for the hosting assembly (background loops, HTTP API) built on the Core engine.</summary>
public static class ServiceAssembly
{
    public const string Name = "IndexKeeper.Service";
}
