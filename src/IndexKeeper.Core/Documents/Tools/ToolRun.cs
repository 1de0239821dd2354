namespace IndexKeeper.Core.Documents.Tools;

/// <summary>How a child program ended: its exit code and what it wrote (standard error cut to its head).</summary>
internal sealed record ToolRun(int ExitCode, byte[] Output, string Error)
{
    public string OutputText => System.Text.Encoding.UTF8.GetString(Output);

    /// <summary>The first line of standard error, for messages.</summary>
    public string ErrorHead =>
        Error.Split('\n', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries)
            .FirstOrDefault(l => !l.StartsWith("Warning: failed to launch javaldx", StringComparison.Ordinal)) ?? string.Empty;
}
