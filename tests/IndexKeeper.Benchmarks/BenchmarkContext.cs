using System.Globalization;
using System.Text.Json;
using System.Text.Json.Serialization;

namespace IndexKeeper.Benchmarks;

/// <summary>What a benchmark gets: a scratch folder, the size profile, and a sink for its figures.</summary>
public sealed class BenchmarkContext
{
    private readonly List<Dictionary<string, object>> figures = [];
    private readonly List<string> notes = [];

    public BenchmarkContext(string name, string workDirectory, bool quick)
    {
        Name = name;
        WorkDirectory = workDirectory;
        Quick = quick;
        LoadAtStart = Measure.LoadAverage();
    }

    public string Name { get; }

    /// <summary>1-minute load average when the benchmark started: the machine is shared, and its load moves wall-clock figures.</summary>
    public double LoadAtStart { get; }

    /// <summary>An empty folder the benchmark may fill; deleted afterwards.</summary>
    public string WorkDirectory { get; }

    /// <summary>True for the small profile (CI smoke run); figures from it are not for the docs.</summary>
    public bool Quick { get; }

    public void Report(string figure, double value, string unit)
    {
        figures.Add(new Dictionary<string, object> { ["figure"] = figure, ["value"] = value, ["unit"] = unit });
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"  {figure,-52} {value,14:G6} {unit}"));
    }

    public void Note(string text)
    {
        notes.Add(text);
        Console.WriteLine("  # " + text);
    }

    internal string ToJson(double elapsedSeconds, double loadAtEnd) => JsonSerializer.Serialize(
        new
        {
            benchmark = Name,
            quick = Quick,
            elapsedSeconds,
            machine = new { Environment.ProcessorCount, os = Environment.OSVersion.VersionString, loadAverageAtStart = LoadAtStart, loadAverageAtEnd = loadAtEnd },
            figures,
            notes,
        },
        new JsonSerializerOptions { WriteIndented = true, NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals });
}
