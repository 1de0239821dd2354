using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;

namespace IndexKeeper.Service.Configuration;

/// <summary>
/// Builds the settings from the standard .NET configuration layers (file, environment, command line),
/// checks the file (line and column of what stops it) and every key's shape (unknown keys with the nearest
/// known one, values of the wrong type), binds them strictly and validates them through the .NET options
/// pipeline (<see cref="IndexKeeperOptionsValidation"/>); every problem found is reported at once.
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

            // A file that cannot be read stops here, with line and column: nothing of it could be trusted.
            var fileProblems = JsonSettingsFile.Problems(Path.GetFullPath(file));
            if (fileProblems.Count > 0)
            {
                throw new ConfigurationException(fileProblems);
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

        // Every unknown key and every value of the wrong type; the rest is bound and validated all the same,
        // so one run names every bad setting, not the first the binder would stop at.
        problems.AddRange(SettingsShape.Problems(configuration, typeof(IndexKeeperOptions), out var badKeys));
        var bindable = badKeys.Count == 0 ? configuration : Without(configuration, badKeys);
        var services = new ServiceCollection();
        services.AddOptions<IndexKeeperOptions>()
            .Configure(options => bindable.Bind(options, binder => binder.ErrorOnUnknownConfiguration = true))
            .PostConfigure(options =>
            {
                // Which encoder settings were given at all: the rest comes from an existing index's own encoder.
                options.Encoder.Given = configuration.GetSection(nameof(IndexKeeperOptions.Encoder)).GetChildren()
                    .Select(c => c.Key).ToHashSet(StringComparer.OrdinalIgnoreCase);
                if (sources.Roots.Count > 0)
                {
                    // --root replaces the file's roots wholesale rather than merging lists index by index.
                    options.Roots = sources.Roots.Select(RootNaming.Split).Select(r => new RootOptions { Name = r.Name ?? string.Empty, Path = r.Path }).ToList();
                }

                NameUnnamedRoots(options.Roots);
            });
        services.AddSingleton<IValidateOptions<IndexKeeperOptions>>(new IndexKeeperOptionsValidation(rootsRequired));
        using var provider = services.BuildServiceProvider();
        try
        {
            var options = provider.GetRequiredService<IOptions<IndexKeeperOptions>>().Value;
            return problems.Count == 0 ? options : throw new ConfigurationException(problems);
        }
        catch (OptionsValidationException ex)
        {
            throw new ConfigurationException([.. problems, .. ex.Failures]);
        }
        catch (InvalidOperationException ex)
        {
            // A binder failure the shape check did not foresee: still a bad setting, named by the binder.
            throw new ConfigurationException([ex.InnerException is { } inner ? $"{ex.Message} ({inner.Message})" : ex.Message]);
        }
    }

    /// <summary>The configuration's values less the keys named (and everything under them).</summary>
    private static IConfiguration Without(IConfiguration configuration, IReadOnlySet<string> keys) =>
        new ConfigurationBuilder().AddInMemoryCollection(configuration.AsEnumerable()
            .Where(pair => pair.Value is not null && !keys.Any(k => pair.Key.Equals(k, StringComparison.OrdinalIgnoreCase) || pair.Key.StartsWith(k + ":", StringComparison.OrdinalIgnoreCase))))
            .Build();

    /// <summary>A root without a Name gets the one derived from its folder and place (<see cref="RootNaming.Derived"/>).</summary>
    private static void NameUnnamedRoots(List<RootOptions> roots)
    {
        var paths = roots.Select(r => r.Path).ToList();
        for (var i = 0; i < roots.Count; i++)
        {
            if (string.IsNullOrEmpty(roots[i].Name))
            {
                roots[i].Name = RootNaming.Derived(paths, i);
                roots[i].NameDerived = true;
            }
        }
    }
}
