using System.Collections;
using System.ComponentModel;
using System.Globalization;
using System.Reflection;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.Configuration.EnvironmentVariables;

namespace IndexKeeper.Service.Configuration;

/// <summary>
/// Checks every key the configuration holds against the settings classes before they are bound, so all
/// that the binder would stop at are reported at once: a key no setting has (named with the nearest known
/// one), a value that is not of the setting's type, a section where a value belongs or the reverse. Each
/// problem names where the key came from (the file, the environment or the command line).
/// </summary>
internal static class SettingsShape
{
    /// <param name="badKeys">The keys (with everything under them) the problems are about, to be left out of binding.</param>
    public static IReadOnlyList<string> Problems(IConfigurationRoot configuration, Type settings, out IReadOnlySet<string> badKeys)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        var problems = new Found();
        foreach (var section in configuration.GetChildren())
        {
            CheckMember(configuration, section, settings, problems);
        }

        badKeys = problems.Keys;
        return problems.Messages;
    }

    private static void CheckMember(IConfigurationRoot root, IConfigurationSection section, Type owner, Found problems)
    {
        var properties = Settable(owner);
        var property = properties.FirstOrDefault(p => string.Equals(p.Name, section.Key, StringComparison.OrdinalIgnoreCase));
        if (property is null)
        {
            var parent = section.Path[..^section.Key.Length];
            var nearest = properties.MinBy(p => Distance(p.Name.ToUpperInvariant(), section.Key.ToUpperInvariant()));
            var hint = nearest is null ? "this section has no settings" : $"did you mean {parent}{nearest.Name}?";
            problems.Add(section.Path, $"{section.Path}: no such setting{From(root, section)}; {hint}");
            return;
        }

        CheckValue(root, section, property.PropertyType, problems);
    }

    private static void CheckValue(IConfigurationRoot root, IConfigurationSection section, Type type, Found problems)
    {
        var scalar = Nullable.GetUnderlyingType(type) ?? type;
        var hasChildren = section.GetChildren().Any();
        if (IsScalar(scalar))
        {
            if (hasChildren)
            {
                problems.Add(section.Path, $"{section.Path}: is one value, not a section{From(root, section)}.");
            }
            else if (section.Value is { Length: > 0 } text && scalar != typeof(string) && !Converts(scalar, text))
            {
                problems.Add(section.Path, $"{section.Path}: '{text}' is not {Describe(scalar)}{From(root, section)}.");
            }

            return;
        }

        if (ElementType(type) is { } element)
        {
            foreach (var item in section.GetChildren())
            {
                if (!int.TryParse(item.Key, NumberStyles.None, CultureInfo.InvariantCulture, out _))
                {
                    problems.Add(item.Path, $"{item.Path}: a list takes items 0, 1, 2 …, not '{item.Key}'{From(root, item)}.");
                    continue;
                }

                CheckValue(root, item, element, problems);
            }

            return;
        }

        if (!hasChildren && section.Value is { Length: > 0 })
        {
            problems.Add(section.Path, $"{section.Path}: is a section of settings, not one value{From(root, section)}.");
            return;
        }

        foreach (var child in section.GetChildren())
        {
            CheckMember(root, child, type, problems);
        }
    }

    /// <summary>The messages, and the keys they are about.</summary>
    private sealed class Found
    {
        public List<string> Messages { get; } = [];

        public HashSet<string> Keys { get; } = new(StringComparer.OrdinalIgnoreCase);

        public void Add(string key, string message)
        {
            Keys.Add(key);
            Messages.Add(message);
        }
    }

    /// <summary>The public settable properties the binder fills.</summary>
    private static List<PropertyInfo> Settable(Type type) =>
        type.GetProperties(BindingFlags.Public | BindingFlags.Instance).Where(p => p.SetMethod is { IsPublic: true }).ToList();

    private static bool IsScalar(Type type) =>
        type.IsPrimitive || type.IsEnum || type == typeof(string) || type == typeof(decimal) || type == typeof(TimeSpan) || type == typeof(Uri);

    private static Type? ElementType(Type type) =>
        type.IsArray ? type.GetElementType()
        : type.IsGenericType && typeof(IEnumerable).IsAssignableFrom(type) && type.GetGenericArguments() is [var element] ? element
        : null;

    private static bool Converts(Type type, string text)
    {
        try
        {
            return TypeDescriptor.GetConverter(type).ConvertFromInvariantString(text) is not null;
        }
        catch (Exception ex) when (ex is FormatException or ArgumentException or NotSupportedException or OverflowException)
        {
            return false;
        }
    }

    private static string Describe(Type type) =>
        type == typeof(bool) ? "true or false"
        : type == typeof(int) || type == typeof(long) ? "a whole number"
        : type == typeof(double) || type == typeof(float) || type == typeof(decimal) ? "a number"
        : type.IsEnum ? "one of " + string.Join(", ", Enum.GetNames(type))
        : "a " + type.Name;

    /// <summary>Where the value came from: the last source that has the key wins, as in the configuration itself.</summary>
    private static string From(IConfigurationRoot root, IConfigurationSection section)
    {
        foreach (var provider in root.Providers.Reverse())
        {
            if (provider.TryGet(section.Path, out _) || provider.GetChildKeys([], section.Path).Any())
            {
                return provider switch
                {
                    FileConfigurationProvider file => $" (in {file.Source.FileProvider?.GetFileInfo(file.Source.Path ?? string.Empty).PhysicalPath ?? file.Source.Path})",
                    EnvironmentVariablesConfigurationProvider => $" (environment {ConfigurationSources.EnvironmentPrefix}{section.Path.Replace(":", "__", StringComparison.Ordinal)})",
                    _ => " (command line)",
                };
            }
        }

        return string.Empty;
    }

    /// <summary>Edit distance (insertions, deletions, substitutions) between two keys.</summary>
    private static int Distance(string a, string b)
    {
        var previous = Enumerable.Range(0, b.Length + 1).ToArray();
        for (var i = 1; i <= a.Length; i++)
        {
            var current = new int[b.Length + 1];
            current[0] = i;
            for (var j = 1; j <= b.Length; j++)
            {
                current[j] = Math.Min(Math.Min(current[j - 1] + 1, previous[j] + 1), previous[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1));
            }

            previous = current;
        }

        return previous[b.Length];
    }
}
