using System.Globalization;

namespace IndexKeeper.Demo;

/// <summary>
/// A three-line text file beside the roots (outside them, so no scan sees it) that remembers the seed and
/// which scripted day the store is on:
/// <code>
/// harrowmere-demo-store 1
/// seed 2026
/// day 1
/// </code>
/// The "1" on the first line is the format version (never change what it means).
/// </summary>
internal sealed record DemoManifest(int Seed, int Day)
{
    public const string FileName = "harrowmere-demo.txt";
    private const string Header = "harrowmere-demo-store 1";

    public static string PathIn(string directory) => Path.Combine(directory, FileName);

    public void Write(string directory) => File.WriteAllText(
        PathIn(directory),
        Header + "\n" + "seed " + Seed.ToString(CultureInfo.InvariantCulture) + "\n" + "day " + Day.ToString(CultureInfo.InvariantCulture) + "\n");

    public static DemoManifest Read(string directory)
    {
        string path = PathIn(directory);
        if (!File.Exists(path))
        {
            throw new InvalidOperationException($"{directory} holds no demo store ({FileName} is missing); generate one first");
        }

        string[] lines = File.ReadAllText(path).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        if (lines.Length != 3 || lines[0] != Header
            || !TryValue(lines[1], "seed ", out int seed) || !TryValue(lines[2], "day ", out int day))
        {
            throw new InvalidDataException($"{path} is not a demo store manifest of version 1");
        }

        return new DemoManifest(seed, day);
    }

    private static bool TryValue(string line, string prefix, out int value)
    {
        value = 0;
        return line.StartsWith(prefix, StringComparison.Ordinal)
            && int.TryParse(line.AsSpan(prefix.Length), NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out value);
    }
}
