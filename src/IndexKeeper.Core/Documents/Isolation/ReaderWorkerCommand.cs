namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>How to start a reader worker: an executable and its arguments (no shell in between).</summary>
public sealed class ReaderWorkerCommand
{
    /// <summary>The hidden first argument of the <c>indexkeeper</c> executable that runs <see cref="ReadWorkerHost"/>.</summary>
    public const string Verb = "read-worker";

    private const string ExecutableName = "indexkeeper";

    public ReaderWorkerCommand(string fileName, IEnumerable<string> arguments)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(fileName);
        ArgumentNullException.ThrowIfNull(arguments);
        FileName = fileName;
        Arguments = [.. arguments];
    }

    public string FileName { get; }

    public IReadOnlyList<string> Arguments { get; }

    /// <summary>
    /// This installation's own executable with <see cref="Verb"/>, found beside the running assembly: the
    /// native launcher when there is one, else the runtime host with the managed assembly.
    /// </summary>
    /// <exception cref="InvalidOperationException">Neither is in <see cref="AppContext.BaseDirectory"/>.</exception>
    public static ReaderWorkerCommand ForThisInstallation()
    {
        var directory = AppContext.BaseDirectory;
        var launcher = Path.Combine(directory, OperatingSystem.IsWindows() ? ExecutableName + ".exe" : ExecutableName);
        if (File.Exists(launcher))
        {
            return new ReaderWorkerCommand(launcher, [Verb]);
        }

        var assembly = Path.Combine(directory, ExecutableName + ".dll");
        if (File.Exists(assembly))
        {
            return new ReaderWorkerCommand(RuntimeHost(), [assembly, Verb]);
        }

        throw new InvalidOperationException(
            $"Cannot find '{ExecutableName}' or '{ExecutableName}.dll' in {directory} to run the reader worker from.");
    }

    public override string ToString() => string.Join(' ', [FileName, .. Arguments]);

    private static string RuntimeHost()
    {
        // The SDK names its host here; a process started by the host is the host itself.
        var fromSdk = Environment.GetEnvironmentVariable("DOTNET_HOST_PATH");
        if (!string.IsNullOrEmpty(fromSdk) && File.Exists(fromSdk))
        {
            return fromSdk;
        }

        var current = Environment.ProcessPath;
        return current is not null && Path.GetFileNameWithoutExtension(current) == "dotnet" ? current : "dotnet";
    }
}
