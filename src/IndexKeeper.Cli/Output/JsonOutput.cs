using System.Text.Encodings.Web;
using System.Text.Json;
using System.Text.Json.Serialization;

namespace IndexKeeper.Cli.Output;

/// <summary>With <c>--json</c> a command prints exactly one JSON object on stdout, field names in camelCase.</summary>
internal static class JsonOutput
{
    public static JsonSerializerOptions Options { get; } = new()
    {
        PropertyNamingPolicy = JsonNamingPolicy.CamelCase,
        WriteIndented = true,
        Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping,
        Converters = { new JsonStringEnumConverter(JsonNamingPolicy.CamelCase) },
    };

    public static void Write<T>(T value) => Console.Out.WriteLine(JsonSerializer.Serialize(value, Options));
}
