namespace IndexKeeper.Cli.CommandLine;

/// <summary>
/// Parses <c>indexkeeper COMMAND [--index DIR] [--root DIR ...] [--config FILE] [--encoder NAME] [--json] [--Section:Key=value ...]</c>
/// plus the named options each command declares (flags take no value and read as "true"). Unknown options are errors, never ignored.
/// </summary>
internal static class ArgumentParser
{
    public static ParsedArguments Parse(
        IReadOnlyList<string> args,
        IReadOnlyDictionary<string, IReadOnlySet<string>> commandOptions,
        IReadOnlyDictionary<string, IReadOnlySet<string>>? commandFlags = null)
    {
        if (args.Count == 0)
        {
            throw new UsageException("no command given.");
        }

        var command = args[0];
        if (!commandOptions.TryGetValue(command, out var allowed))
        {
            throw new UsageException($"unknown command '{command}'; commands: {string.Join(", ", commandOptions.Keys)}.");
        }

        string? index = null;
        string? config = null;
        var json = false;
        var roots = new List<string>();
        var overrides = new List<string>();
        var positional = new List<string>();
        var named = new Dictionary<string, string>(StringComparer.Ordinal);
        var flags = commandFlags?.GetValueOrDefault(command) ?? new HashSet<string>();
        for (var i = 1; i < args.Count; i++)
        {
            var arg = args[i];
            string Value()
            {
                if (i + 1 >= args.Count || args[i + 1].StartsWith("--", StringComparison.Ordinal))
                {
                    throw new UsageException($"{arg} needs a value.");
                }

                return args[++i];
            }

            switch (arg)
            {
                case "--index":
                    index = Value();
                    break;
                case "--root":
                    roots.Add(Value());
                    break;
                case "--config":
                    config = Value();
                    break;
                case "--encoder":
                    overrides.Add("Encoder:Name=" + Value());
                    break;
                case "--json":
                    json = true;
                    break;
                case "--":
                    positional.AddRange(args.Skip(i + 1));
                    i = args.Count;
                    break;
                default:
                    if (arg.StartsWith("--", StringComparison.Ordinal) && arg.Contains(':', StringComparison.Ordinal))
                    {
                        overrides.Add(arg[2..]);
                    }
                    else if (arg.StartsWith('-') && arg.Length > 1)
                    {
                        var name = arg.TrimStart('-');
                        if (flags.Contains(name))
                        {
                            named[name] = "true";
                        }
                        else if (!allowed.Contains(name))
                        {
                            throw new UsageException($"'{command}' has no option '{arg}'.");
                        }
                        else
                        {
                            named[name] = Value();
                        }
                    }
                    else
                    {
                        positional.Add(arg);
                    }

                    break;
            }
        }

        var parsed = new ParsedArguments { Command = command, IndexDirectory = index, ConfigFile = config, Json = json };
        parsed.Roots.AddRange(roots);
        parsed.Overrides.AddRange(overrides);
        parsed.Positional.AddRange(positional);
        foreach (var (key, value) in named)
        {
            parsed.Named[key] = value;
        }

        return parsed;
    }
}
