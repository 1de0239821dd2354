using System.Text.Json;
using IndexKeeper.Service.Daemon;

namespace IndexKeeper.Cli.Output;

/// <summary>With <c>--json</c> a command prints exactly one JSON object on stdout, field names in camelCase.</summary>
internal static class JsonOutput
{
    /// <summary>The daemon's API serves the same objects in the same shape.</summary>
    public static JsonSerializerOptions Options => ApiJson.Options;

    public static void Write<T>(T value) => Console.Out.WriteLine(JsonSerializer.Serialize(value, Options));
}
