using System.CommandLine;

namespace IndexKeeper.Cli.CommandLine;

/// <summary>
/// An option of one value given more than once keeps its last value, as it always has: a script or a test
/// that appends <c>--listen</c> or <c>--index</c> to a command line it was handed overrides the earlier one.
/// </summary>
internal static class LastValue
{
    public static Option<string?> Wins(Option<string?> option)
    {
        ArgumentNullException.ThrowIfNull(option);
        option.Arity = ArgumentArity.OneOrMore;
        option.CustomParser = result => result.Tokens[^1].Value;
        return option;
    }

    /// <summary>A whole number at least 1, the last one given.</summary>
    public static Option<int> WinsPositive(Option<int> option)
    {
        ArgumentNullException.ThrowIfNull(option);
        option.Arity = ArgumentArity.OneOrMore;
        option.CustomParser = result =>
        {
            var text = result.Tokens[^1].Value;
            if (int.TryParse(text, System.Globalization.NumberStyles.None, System.Globalization.CultureInfo.InvariantCulture, out var value) && value > 0)
            {
                return value;
            }

            result.AddError($"{option.Name} {text}: give a whole number of 1 or more.");
            return 0;
        };
        return option;
    }
}
