using System.Globalization;
using System.Text.Json;

namespace IndexKeeper.Benchmarks;

/// <summary>What a benchmark gets: a scratch folder, the size profile, and a sink for its figures.</summary>
public sealed class BenchmarkContext
{
    private readonly List<Dictionary<string, object>> figures = [];

    public BenchmarkContext(string name, string workDirectory, bool quick)
    {
        Name = name;
        WorkDirectory = workDirectory;
        Quick = quick;
    }

    public string Name { get; }

    /// <summary>An empty folder the benchmark may fill; deleted afterwards.</summary>
    public string WorkDirectory { get; }

    /// <summary>True for the small profile (CI smoke run); figures from it are not for the docs.</summary>
    public bool Quick { get; }

    public void Report(string figure, double value, string unit)
    {
        figures.Add(new Dictionary<string, object> { ["figure"] = figure, ["value"] = value, ["unit"] = unit });
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"  {figure,-52} {value,14:G6} {unit}"));
    }

    public void Note(string text) => Console.WriteLine("  # " + text);

    internal string ToJson() => JsonSerializer.Serialize(
        new { benchmark = Name, quick = Quick, machine = new { Environment.ProcessorCount, os = Environment.OSVersion.VersionString }, figures },
        new JsonSerializerOptions { WriteIndented = true });
}
