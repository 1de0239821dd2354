using System.Text.Json;

namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>
/// Carries <see cref="ReaderSettings"/> from the supervisor to its worker in one environment variable,
/// as versioned JSON (docs/reader-worker.md, "Settings"): the worker refuses another version at start.
/// </summary>
internal static class ReaderSettingsCodec
{
    public const string Variable = "INDEXKEEPER_READER_SETTINGS";

    /// <summary>Version of the JSON layout; must equal docs/reader-worker.md. Never reuse a number.</summary>
    public const int Version = 1;

    private static readonly JsonSerializerOptions Json = new(JsonSerializerDefaults.Web);

    public static string Encode(ReaderSettings settings) => JsonSerializer.Serialize(new Envelope(Version, settings), Json);

    /// <summary>The settings in the variable, or the defaults when it is not set.</summary>
    /// <exception cref="ReaderProtocolException">The variable holds another version or no settings.</exception>
    public static ReaderSettings FromEnvironment()
    {
        var text = Environment.GetEnvironmentVariable(Variable);
        if (string.IsNullOrEmpty(text))
        {
            return ReaderSettings.Default;
        }

        Envelope? envelope;
        try
        {
            envelope = JsonSerializer.Deserialize<Envelope>(text, Json);
        }
        catch (JsonException e)
        {
            throw new ReaderProtocolException($"{Variable} is not valid settings JSON: {e.Message}");
        }

        if (envelope?.Version != Version || envelope.Settings is null)
        {
            throw new ReaderProtocolException($"{Variable} holds settings version {envelope?.Version}, this worker reads version {Version}");
        }

        return envelope.Settings;
    }

    private sealed record Envelope(int Version, ReaderSettings? Settings);
}
