namespace IndexKeeper.Service.Daemon;

/// <summary>The status page: one HTML file with its script and styles inline, embedded in the assembly (no front-end build, no CDN).</summary>
internal static class StatusPageResource
{
    public static string Html { get; } = Load();

    private static string Load()
    {
        using var stream = typeof(StatusPageResource).Assembly.GetManifestResourceStream("IndexKeeper.Service.status.html")
            ?? throw new InvalidOperationException("the status page resource is missing from the build");
        using var reader = new StreamReader(stream);
        return reader.ReadToEnd();
    }
}
