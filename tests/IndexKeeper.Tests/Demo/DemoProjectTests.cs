using IndexKeeper.Demo;

namespace IndexKeeper.Tests.Demo;

public sealed class DemoProjectTests
{
    [Fact]
    public void The_generator_uses_no_other_project()
    {
        // DEVELOPERS.md, "Layout": the demo generator writes files only; the CLI's demo command runs the index.
        var own = typeof(DemoStore).Assembly.GetName().Name;
        var projects = typeof(DemoStore).Assembly.GetReferencedAssemblies()
            .Select(reference => reference.Name!)
            .Where(name => name.StartsWith("IndexKeeper", StringComparison.Ordinal) && name != own)
            .ToList();
        Assert.Empty(projects);
    }
}
