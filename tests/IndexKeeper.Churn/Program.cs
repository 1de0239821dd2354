using System.Globalization;
using System.Text.Json;
using System.Text.Json.Serialization;
using IndexKeeper.Churn;
using IndexKeeper.Churn.Report;

// dotnet run -c Release --project tests/IndexKeeper.Churn -- [--quick | --scale [--pages N]] [--seed N] [--out DIR] [--work DIR]
var quick = args.Contains("--quick");
var scale = args.Contains("--scale");
var seed = Option("--seed") is { } s ? int.Parse(s, CultureInfo.InvariantCulture) : 2026;
var output = Path.GetFullPath(Option("--out") ?? Path.Combine("artifacts", "churn"));
var ownWork = Option("--work") is null;
var work = Path.GetFullPath(Option("--work") ?? Path.Combine(Path.GetTempPath(), "indexkeeper-churn-" + Guid.NewGuid().ToString("N")[..8]));
if (Directory.Exists(work) && Directory.EnumerateFileSystemEntries(work).Any())
{
    Console.Error.WriteLine($"--work {work} is not empty; the simulator only writes into a new or empty directory");
    return 2;
}

var json = new JsonSerializerOptions
{
    WriteIndented = true,
    PropertyNamingPolicy = JsonNamingPolicy.CamelCase,
    NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
};
if (scale)
{
    var pages = Option("--pages") is { } p ? int.Parse(p, CultureInfo.InvariantCulture) : 100_000;
    Console.WriteLine($"churn scale run, {pages} pages, work directory {work}");
    try
    {
        var figures = new ScaleRun(pages, seed, work, Console.WriteLine).Run();
        Directory.CreateDirectory(output);
        var text = JsonSerializer.Serialize(figures, json);
        File.WriteAllText(Path.Combine(output, "churn-scale.json"), text);
        Console.WriteLine(text);
        return 0;
    }
    finally
    {
        if (ownWork && Directory.Exists(work))
        {
            Directory.Delete(work, recursive: true);
        }
    }
}

var profile = quick ? ChurnProfile.Quick : ChurnProfile.Month;
Console.WriteLine($"churn simulation, profile {profile.Name}, seed {seed}, work directory {work}");
try
{
    var report = new ChurnSimulation(profile, seed, work, Console.WriteLine).Run();
    Directory.CreateDirectory(output);
    var name = "churn-" + profile.Name;
    File.WriteAllText(Path.Combine(output, name + ".json"), JsonSerializer.Serialize(report, json));
    File.WriteAllText(Path.Combine(output, name + ".md"), MarkdownTables.Write(report));
    CallsChart.Write(Path.Combine(output, name + "-calls.png"), $"Encoder page calls per day, {report.Days[^1].Pages:N0}-page drive, {profile.Days} days (seed {seed})", report.Days);
    Console.WriteLine(MarkdownTables.Write(report));
    Console.WriteLine($"figures written to {output}; {report.TotalSeconds:0} s in all");
    var misses = report.Days.Sum(d => d.IndexKeeper.Misses + d.IndexKeeperUnserved);
    return misses == 0 && report.Rebuild.Equal ? 0 : 1;
}
finally
{
    if (ownWork && Directory.Exists(work))
    {
        Directory.Delete(work, recursive: true);
    }
}

string? Option(string name)
{
    var at = Array.IndexOf(args, name);
    return at >= 0 && at + 1 < args.Length ? args[at + 1] : null;
}
