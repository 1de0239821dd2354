using IndexKeeper.Service.Application;
using NetArchTest.Rules;

namespace IndexKeeper.Tests.Architecture;

/// <summary>
/// The application layer (docs/architecture.md) is what the commands, the daemon and the remote workers to
/// come all call: it knows no host, no HTTP and no console, and nothing of the daemon that hosts it.
/// </summary>
public sealed class ApplicationLayerTests
{
    private const string Application = "IndexKeeper.Service.Application";

    [Fact]
    public void The_application_layer_knows_no_daemon_host_or_http()
    {
        var result = Types.InAssembly(typeof(OpenIndex).Assembly)
            .That().ResideInNamespace(Application)
            .ShouldNot().HaveDependencyOnAny("IndexKeeper.Service.Daemon", "Microsoft.AspNetCore", "Microsoft.Extensions.Hosting", "System.Console")
            .GetResult();
        Assert.True(result.IsSuccessful, "The application layer reaches into a host: " + string.Join(", ", result.FailingTypes?.Select(t => t.Name) ?? []));
    }

    [Fact]
    public void The_checker_reports_an_edge_that_exists()
    {
        // The daemon does use the application layer: the same rule the other way round must fail, or the
        // rule above would pass whatever the code did.
        var result = Types.InAssembly(typeof(OpenIndex).Assembly)
            .That().ResideInNamespace("IndexKeeper.Service.Daemon")
            .ShouldNot().HaveDependencyOnAny(Application)
            .GetResult();
        Assert.False(result.IsSuccessful);
        Assert.Contains(result.FailingTypes, t => t.Name == "IndexWorker");
    }

    [Fact]
    public void Every_use_case_takes_its_dependencies_in_its_constructor()
    {
        // No service locator: a use case is handed what it uses, never a provider to ask.
        var result = Types.InAssembly(typeof(OpenIndex).Assembly)
            .That().ResideInNamespace(Application).And().HaveNameEndingWith("Operation")
            .ShouldNot().HaveDependencyOnAny("System.IServiceProvider", "Microsoft.Extensions.DependencyInjection")
            .GetResult();
        Assert.True(result.IsSuccessful, "A use case asks a container: " + string.Join(", ", result.FailingTypes?.Select(t => t.Name) ?? []));
    }
}
