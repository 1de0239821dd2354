using System.Globalization;
using Microsoft.Extensions.Configuration;

namespace IndexKeeper.Service.Configuration;

/// <summary>
/// Builds the settings from the standard .NET configuration layers (file, environment, command line),
/// binds them strictly (an unknown or mistyped key is an error naming it) and validates them.
/// </summary>
public static class OptionsLoader
{
    public static IndexKeeperOptions Load(ConfigurationSources sources, bool rootsRequired = true)
    {
        ArgumentNullException.ThrowIfNull(sources);
        var problems = new List<string>();
        var builder = new ConfigurationBuilder();
        if (sources.ConfigFile is { } file)
        {
            if (!File.Exists(file))
            {
                throw new ConfigurationException([$"--config: the file '{file}' does not exist."]);
            }

            builder.AddJsonFile(Path.GetFullPath(file), optional: false, reloadOnChange: false);
        }

        builder.AddEnvironmentVariables(ConfigurationSources.EnvironmentPrefix);
        var overrides = new Dictionary<string, string?>(StringComparer.OrdinalIgnoreCase);
        if (sources.IndexDirectory is { } index)
        {
            overrides[nameof(IndexKeeperOptions.IndexDirectory)] = index;
        }

        foreach (var pair in sources.Overrides)
        {
            var equals = pair.IndexOf('=', StringComparison.Ordinal);
            if (equals <= 0)
            {
                problems.Add($"'--{pair}': an override is --Section:Key=value.");
                continue;
            }

            overrides[pair[..equals]] = pair[(equals + 1)..];
        }

        builder.AddInMemoryCollection(overrides);
        IConfigurationRoot configuration;
        try
        {
            configuration = builder.Build();
        }
        catch (Exception ex) when (ex is InvalidDataException or FormatException or IOException)
        {
            throw new ConfigurationException([$"--config: cannot read '{sources.ConfigFile}': {ex.Message}"]);
        }

        var options = Bind(configuration, problems);
        if (problems.Count > 0 || options is null)
        {
            throw new ConfigurationException(problems);
        }

        // Which encoder settings were given at all: the rest comes from an existing index's own encoder.
        options.Encoder.Given = configuration.GetSection(nameof(IndexKeeperOptions.Encoder)).GetChildren()
            .Select(c => c.Key).ToHashSet(StringComparer.OrdinalIgnoreCase);

        if (sources.Roots.Count > 0)
        {
            // --root replaces the file's roots wholesale rather than merging lists index by index.
            options.Roots = sources.Roots.Select((path, i) => new RootOptions { Name = RootNameFor(sources.Roots, i), Path = path }).ToList();
        }

        var errors = IndexKeeperOptionsValidator.Validate(options, rootsRequired);
        if (errors.Count > 0)
        {
            throw new ConfigurationException(errors);
        }

        return options;
    }

    private static IndexKeeperOptions? Bind(IConfiguration configuration, List<string> problems)
    {
        try
        {
            return configuration.Get<IndexKeeperOptions>(o => o.ErrorOnUnknownConfiguration = true) ?? new IndexKeeperOptions();
        }
        catch (InvalidOperationException ex)
        {
            var message = ex.InnerException is { } inner ? $"{ex.Message} ({inner.Message})" : ex.Message;
            if (!problems.Contains(message))
            {
                problems.Add(message);
            }

            return null;
        }
    }

    /// <summary>A root given by path is named after its folder, made unique with a number.</summary>
    private static string RootNameFor(IReadOnlyList<string> roots, int index)
    {
        static string Clean(string path)
        {
            var name = Path.GetFileName(Path.TrimEndingDirectorySeparator(Path.GetFullPath(path)));
            var cleaned = new string(name.Select(c => char.IsAsciiLetterOrDigit(c) || c is '-' or '_' or '.' ? c : '-').ToArray());
            return cleaned.Length is > 0 and <= 48 ? cleaned : "root";
        }

        var name = Clean(roots[index]);
        var earlier = Enumerable.Range(0, index).Count(i => Clean(roots[i]) == name);
        return earlier == 0 ? name : string.Create(CultureInfo.InvariantCulture, $"{name}-{earlier + 1}");
    }
}
