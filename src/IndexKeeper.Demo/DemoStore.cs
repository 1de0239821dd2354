namespace IndexKeeper.Demo;

/// <summary>
/// The demo document store of the invented Harrowmere Water Authority: manuals, inspection forms, monthly
/// reports and drawings as PDFs under "shared-drive", scanned pages as PNG, JPEG and a multi-page TIFF
/// under "field-scans". The same seed gives the same bytes on every run: nothing is read from the clock,
/// the culture or randomised hashing.
/// </summary>
public static class DemoStore
{
    /// <summary>Writes the store of the first day into <paramref name="directory"/>, which must be new or
    /// empty (the demo never writes over anything that is already there).</summary>
    public static DemoStoreInfo Generate(string directory, int seed = 2026)
    {
        string root = Path.GetFullPath(directory);
        if (Directory.Exists(root) && Directory.EnumerateFileSystemEntries(root).Any())
        {
            throw new IOException($"{root} is not empty; the demo store is only written into a new or empty directory");
        }

        Directory.CreateDirectory(root);
        var files = StorePlan.Create(seed).Files();
        // Every file draws from its own stream, so building them in parallel changes no byte.
        Parallel.ForEach(
            files,
            new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount },
            file => DemoFiles.Write(root, file.StorePath, file.Build()));
        var documents = files.Select(file => new DemoDocument(file.Root, file.RelativePath, file.PageCount)).ToList();

        new DemoManifest(seed, Day: 1).Write(root);
        return new DemoStoreInfo(
            [
                new DemoRoot(StorePlan.SharedDrive, Path.Combine(root, StorePlan.SharedDrive)),
                new DemoRoot(StorePlan.FieldScans, Path.Combine(root, StorePlan.FieldScans)),
            ],
            documents);
    }

    /// <summary>Makes the scripted changes of the second day to a store made by <see cref="Generate"/>,
    /// and returns them with the pages each one truly changed. Runs once per store.</summary>
    public static IReadOnlyList<DemoChange> ApplyDayTwoChanges(string directory)
    {
        string root = Path.GetFullPath(directory);
        var manifest = DemoManifest.Read(root);
        if (manifest.Day != 1)
        {
            throw new InvalidOperationException($"the demo store in {root} is already on day {manifest.Day}; day two runs once");
        }

        var changes = DayTwoScript.Apply(root, StorePlan.Create(manifest.Seed));
        (manifest with { Day = 2 }).Write(root);
        return changes;
    }
}
