namespace IndexKeeper.Service.Configuration;

/// <summary>Where settings come from for one command: the file, the shorthand options and the overrides.</summary>
/// <param name="ConfigFile">JSON file given with <c>--config</c>, or null.</param>
/// <param name="IndexDirectory">From <c>--index</c>; wins over the file.</param>
/// <param name="Roots">From <c>--root</c>; when given, they replace the roots of the file.</param>
/// <param name="Overrides">From <c>--Section:Key=value</c> arguments, highest precedence.</param>
public sealed record ConfigurationSources(string? ConfigFile, string? IndexDirectory, IReadOnlyList<string> Roots, IReadOnlyList<string> Overrides)
{
    public const string EnvironmentPrefix = "INDEXKEEPER_";
}
