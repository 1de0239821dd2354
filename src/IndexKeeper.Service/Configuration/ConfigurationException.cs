namespace IndexKeeper.Service.Configuration;

/// <summary>Bad settings; the command exits with code 2 and prints every problem (one problem: one line).</summary>
public sealed class ConfigurationException : Exception
{
    public ConfigurationException(IReadOnlyList<string> problems)
        : base(problems.Count == 1
            ? "Bad configuration: " + problems[0]
            : "Bad configuration:" + Environment.NewLine + string.Join(Environment.NewLine, problems.Select(p => "  " + p))) =>
        Problems = problems;

    public IReadOnlyList<string> Problems { get; }
}
