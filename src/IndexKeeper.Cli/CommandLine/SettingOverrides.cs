namespace IndexKeeper.Cli.CommandLine;

/// <summary>
/// Any setting given on the command line as <c>--Section:Key=value</c> (docs/cli.md). Setting names are open
/// ended (every key of the configuration), so these tokens are taken out before the parser sees the rest:
/// a token is a setting when it starts with <c>--</c> and its name (up to any '=') has a ':' and is no
/// declared option. After <c>--</c> every token is an argument.
/// </summary>
internal static class SettingOverrides
{
    /// <param name="optionNames">Every declared option name (with its dashes): never taken for a setting.</param>
    public static (string[] Arguments, List<string> Settings) Split(IReadOnlyList<string> args, IReadOnlySet<string> optionNames)
    {
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(optionNames);
        var rest = new List<string>(args.Count);
        var overrides = new List<string>();
        for (var i = 0; i < args.Count; i++)
        {
            var arg = args[i];
            if (arg == "--")
            {
                rest.AddRange(args.Skip(i));
                break;
            }

            if (IsSetting(arg, optionNames))
            {
                overrides.Add(arg[2..]);
            }
            else
            {
                rest.Add(arg);
            }
        }

        return ([.. rest], overrides);
    }

    private static bool IsSetting(string arg, IReadOnlySet<string> optionNames)
    {
        if (!arg.StartsWith("--", StringComparison.Ordinal))
        {
            return false;
        }

        var name = arg.Split('=', 2)[0];
        var colon = name.IndexOf(':', StringComparison.Ordinal);

        // "--index:DIR" is the parser's own way of writing "--index DIR", not a setting.
        return colon > 2 && !optionNames.Contains(name[..colon]);
    }
}
