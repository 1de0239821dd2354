using System.Text.Json;
using System.Text.Json.Nodes;
using IndexKeeper.Service.Daemon;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// The daemon's API contract: the OpenAPI document it generates from its endpoints (OpenAPI Specification
/// 3.1) equals the committed docs/api/openapi-v1.json, so a path, parameter or report field that changes is a
/// reviewed change of that file; and the answers the daemon actually writes use only the fields their schemas name.
/// IK_WRITE_OPENAPI=1 rewrites the committed file from the daemon (after a change on purpose; see docs/api.md).
/// </summary>
public sealed class ApiContractTests
{
    private static readonly string Committed = Path.Combine(RepositoryRoot.Path, "docs", "api", "openapi-v1.json");

    [Fact]
    public async Task TheServedDocumentIsTheCommittedOneAndTheAnswersFitItsSchemas()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "culvert-inspection.pdf"), StorePdfs.Document("Wetherby", 2));
        using var daemon = RunningDaemon.Start(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--Daemon:SampleSeconds=0.2", "--Schedule:Windows:0=Mon-Sun 00:00-24:00"]);
        daemon.WaitUntil("the pages are embedded", () => daemon.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64() == 2);

        var served = JsonNode.Parse(daemon.GetText(ApiContract.Path))!.AsObject();
        if (Environment.GetEnvironmentVariable("IK_WRITE_OPENAPI") == "1")
        {
            File.WriteAllText(Committed, served.ToJsonString(new JsonSerializerOptions { WriteIndented = true }) + "\n");
        }

        var committed = JsonNode.Parse(File.ReadAllText(Committed))!;
        Assert.True(
            JsonNode.DeepEquals(committed, served),
            $"the API's OpenAPI document differs from {Committed}: review the change, raise ApiContract.Version if a field was removed or changed meaning, and run this test with IK_WRITE_OPENAPI=1");
        Assert.Equal(ApiContract.Version, served["info"]!["version"]!.GetValue<string>());
        Assert.Equal(
            ["/api/daemon", "/api/documents", "/api/plan", "/api/search", "/api/status", "/health"],
            served["paths"]!.AsObject().Select(p => p.Key).Order(StringComparer.Ordinal));

        var schemas = served["components"]!["schemas"]!.AsObject();
        foreach (var (path, schema) in new[]
        {
            ("/api/status", "StatusReport"), ("/api/daemon", "DaemonReport"), ("/api/documents", "DocumentListReport"),
            ("/api/search?q=Wetherby+register&k=2", "SearchReport"), ("/api/plan", "PlanReport"), ("/health", "HealthReport"),
        })
        {
            var problems = new List<string>();
            Fits(JsonNode.Parse(daemon.GetText(path)), schemas[schema]!.AsObject(), schemas, path, problems);
            Assert.True(problems.Count == 0, $"{path} writes fields its schema {schema} does not name:\n" + string.Join('\n', problems));
        }

        // A 400 is the schema's ApiError.
        using var bad = await daemon.Client.GetAsync(new Uri("/api/search?q=", UriKind.Relative));
        var errors = new List<string>();
        Fits(JsonNode.Parse(await bad.Content.ReadAsStringAsync()), schemas["ApiError"]!.AsObject(), schemas, "400", errors);
        Assert.Empty(errors);
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }

    /// <summary>Every property of every object in <paramref name="value"/> is one its schema names (following $ref, items, anyOf/oneOf and additionalProperties).</summary>
    private static void Fits(JsonNode? value, JsonObject schema, JsonObject schemas, string at, List<string> problems)
    {
        if (schema["$ref"] is { } reference)
        {
            Fits(value, schemas[reference.GetValue<string>().Split('/')[^1]]!.AsObject(), schemas, at, problems);
            return;
        }

        foreach (var key in new[] { "anyOf", "oneOf", "allOf" })
        {
            if (schema[key] is JsonArray alternatives)
            {
                // Nullable references come as anyOf [null, $ref]: the value fits the alternative that is an object schema.
                foreach (var alternative in alternatives.OfType<JsonObject>().Where(a => a["$ref"] is not null || a["properties"] is not null))
                {
                    Fits(value, alternative, schemas, at, problems);
                }
            }
        }

        switch (value)
        {
            case JsonObject obj when schema["properties"] is JsonObject properties:
                foreach (var (name, inner) in obj)
                {
                    if (properties[name] is JsonObject property)
                    {
                        Fits(inner, property, schemas, at + "." + name, problems);
                    }
                    else
                    {
                        problems.Add(at + "." + name);
                    }
                }

                break;
            case JsonObject obj when schema["additionalProperties"] is JsonObject values:
                foreach (var (name, inner) in obj)
                {
                    Fits(inner, values, schemas, at + "." + name, problems);
                }

                break;
            case JsonArray array when schema["items"] is JsonObject items:
                for (var i = 0; i < array.Count; i++)
                {
                    Fits(array[i], items, schemas, $"{at}[{i}]", problems);
                }

                break;
        }
    }
}
