using System.Text.Json;
using System.Text.Json.Serialization;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Http.Json;
using Microsoft.AspNetCore.OpenApi;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.OpenApi;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// The versioned contract of the daemon's JSON API (docs/api.md): an OpenAPI document generated from the
/// endpoints by ASP.NET Core, served at <see cref="Path"/>. A change of a path, a parameter or a field of a
/// report changes the document, and a test compares it with the committed copy (docs/api/openapi-v1.json).
/// </summary>
public static class ApiContract
{
    /// <summary>The contract's version: raise it when a field is removed or changes meaning (adding one is compatible).</summary>
    public const string Version = "1";

    public const string DocumentName = "v" + Version;

    /// <summary>Where the daemon serves the document.</summary>
    public const string Path = "/api/openapi/" + DocumentName + ".json";

    public static void AddTo(IServiceCollection services)
    {
        // The schemas are made from the same serializer settings the endpoints write with (ApiJson).
        services.Configure<JsonOptions>(o =>
        {
            o.SerializerOptions.PropertyNamingPolicy = ApiJson.Options.PropertyNamingPolicy;
            o.SerializerOptions.NumberHandling = ApiJson.Options.NumberHandling;
            o.SerializerOptions.Converters.Add(new JsonStringEnumConverter(JsonNamingPolicy.CamelCase));
        });
        services.AddOpenApi(DocumentName, o => o.AddDocumentTransformer((document, _, _) =>
        {
            document.Info = new OpenApiInfo
            {
                Title = "IndexKeeper daemon API",
                Version = Version,
                Description = "What `indexkeeper run` answers over HTTP (docs/daemon.md); the bodies are the commands' --json objects.",
            };
            document.Servers = [];
            return Task.CompletedTask;
        }));
    }

    public static void Map(WebApplication app) => app.MapOpenApi("/api/openapi/{documentName}.json");

    /// <summary>Declares the query parameters of an endpoint that reads its query itself (to check repeats and caps before binding).</summary>
    public static RouteHandlerBuilder QueryParameters(this RouteHandlerBuilder endpoint, params (string Name, JsonSchemaType Type, bool Required, string Description)[] parameters) =>
        endpoint.AddOpenApiOperationTransformer((operation, _, _) =>
        {
            operation.Parameters ??= [];
            foreach (var (name, type, required, description) in parameters)
            {
                operation.Parameters.Add(new OpenApiParameter
                {
                    Name = name,
                    In = ParameterLocation.Query,
                    Required = required,
                    Description = description,
                    Schema = new OpenApiSchema { Type = type },
                });
            }

            return Task.CompletedTask;
        });
}
