using IndexKeeper.Core.Scheduling;

namespace IndexKeeper.Service.Configuration;

/// <summary>
/// Checks every setting at start and reports every failure at once, each naming the setting and what
/// is allowed; the host refuses to run any stage while one remains.
/// </summary>
public static class IndexKeeperOptionsValidator
{
    /// <summary>Encoder names this build knows.</summary>
    public static IReadOnlyList<string> EncoderNames { get; } = ["hashed-terms", "minilm", "page-image"];

    /// <param name="rootsRequired">False for commands that only read the index (status, search, encoders): they need no root.</param>
    public static IReadOnlyList<string> Validate(IndexKeeperOptions options, bool rootsRequired = true)
    {
        ArgumentNullException.ThrowIfNull(options);
        var errors = new List<string>();
        if (string.IsNullOrWhiteSpace(options.IndexDirectory))
        {
            errors.Add("IndexDirectory: must name a folder (use --index DIR).");
        }

        if (rootsRequired && options.Roots.Count == 0)
        {
            errors.Add("Roots: at least one root is needed (use --root DIR or a Roots list in the configuration file).");
        }

        var names = new HashSet<string>(StringComparer.Ordinal);
        for (var i = 0; i < options.Roots.Count; i++)
        {
            var root = options.Roots[i];
            var at = $"Roots:{i}";
            if (!RootNaming.IsAllowed(root.Name))
            {
                errors.Add($"{at}:Name: '{root.Name}' is not allowed; use 1-64 letters, digits, '-', '_' or '.'.");
            }
            else if (!names.Add(root.Name))
            {
                var derived = root.NameDerived ? " (derived from its Path, as none was given)" : string.Empty;
                errors.Add($"{at}:Name: '{root.Name}'{derived} is used by two roots; root names must be unique (give each root its own Name).");
            }

            if (string.IsNullOrWhiteSpace(root.Path))
            {
                errors.Add($"{at}:Path: must name a folder.");
            }
            else if (!string.IsNullOrWhiteSpace(options.IndexDirectory) && IsSameOrInside(options.IndexDirectory, root.Path))
            {
                errors.Add($"{at}:Path: the index directory '{options.IndexDirectory}' lies inside this root; keep the index outside every root.");
            }

            CheckGlobs(errors, $"{at}:Include", root.Include);
            CheckGlobs(errors, $"{at}:Exclude", root.Exclude);
            if (root.PollMinutes is { } poll)
            {
                Range(errors, $"{at}:PollMinutes", poll, 0, 7 * 24 * 60);
            }
        }

        var limits = options.Limits;
        Range(errors, "Limits:MaxFileMegabytes", limits.MaxFileMegabytes, 1, 1024 * 1024);
        Range(errors, "Limits:MaxPages", limits.MaxPages, 1, 1_000_000);
        Range(errors, "Limits:MaxDecodedStreamMegabytes", limits.MaxDecodedStreamMegabytes, 1, 4096);
        Range(errors, "Limits:ReadTimeoutSeconds", limits.ReadTimeoutSeconds, 0.1, 3600);
        Range(errors, "Limits:WorkerMemoryMegabytes", limits.WorkerMemoryMegabytes, 128, 1024 * 1024);
        var readers = options.Readers;
        Range(errors, "Readers:OcrPageTimeoutSeconds", readers.OcrPageTimeoutSeconds, 1, 3600);
        Range(errors, "Readers:ConversionTimeoutSeconds", readers.ConversionTimeoutSeconds, 1, 3600);
        Range(errors, "Readers:ConversionMemoryMegabytes", readers.ConversionMemoryMegabytes, 256, 1024 * 1024);
        Range(errors, "Readers:MaxEmailNesting", readers.MaxEmailNesting, 0, 64);
        Range(errors, "Readers:MaxEmailAttachments", readers.MaxEmailAttachments, 0, 10_000);
        errors.AddRange(ReaderSetup.Problems(readers));
        Range(errors, "Detect:SettleSeconds", options.Detect.SettleSeconds, 0, 3600);
        if (!EncoderNames.Contains(options.Encoder.Name))
        {
            errors.Add($"Encoder:Name: '{options.Encoder.Name}' is not an encoder; built in: {string.Join(", ", EncoderNames)}.");
        }

        if (options.Encoder.Dimensions is < 64 or > 4096 || options.Encoder.Dimensions % 64 != 0)
        {
            errors.Add($"Encoder:Dimensions: {options.Encoder.Dimensions} is not allowed; use a multiple of 64 from 64 to 4096.");
        }

        Range(errors, "Encoder:BatchSize", options.Encoder.BatchSize, 1, 4096);
        Range(errors, "Encoder:PoolFactor", options.Encoder.PoolFactor, 1, 64);
        Range(errors, "Encoder:IntraOpThreads", options.Encoder.IntraOpThreads, 0, 256);
        if (options.Encoder.Name == "minilm" && options.Encoder.Dimensions > 384)
        {
            errors.Add($"Encoder:Dimensions: {options.Encoder.Dimensions} is not allowed for minilm; its projection keeps at most the model's 384 dimensions.");
        }

        if (options.Encoder.Name == "page-image")
        {
            // Model files and pdftoppm are looked for now, so a missing one stops the start, not the first page.
            errors.AddRange(PageImageSettings.Validate(options.Encoder));
        }

        var storage = options.Storage;
        Range(errors, "Storage:SealAtMegabytes", storage.SealAtMegabytes, 1, 64 * 1024);
        Range(errors, "Storage:SealAtHours", storage.SealAtHours, 0.01, 24 * 365);
        Range(errors, "Storage:CompactDeadShare", storage.CompactDeadShare, 0.01, 0.99);
        Range(errors, "Storage:SmallSegmentMegabytes", storage.SmallSegmentMegabytes, 1, 64 * 1024);
        Range(errors, "Storage:MinSmallSegmentsToMerge", storage.MinSmallSegmentsToMerge, 2, 1000);
        Range(errors, "Detect:FullWalkMinutes", options.Detect.FullWalkMinutes, 0.05, 7 * 24 * 60);
        Range(errors, "Detect:WatcherBufferKilobytes", options.Detect.WatcherBufferKilobytes, 4, 64);
        Range(errors, "Detect:MaxPendingPaths", options.Detect.MaxPendingPaths, 1, 10_000_000);
        Range(errors, "Detect:NetworkPollMinutes", options.Detect.NetworkPollMinutes, 0.05, 7 * 24 * 60);
        Range(errors, "Detect:RootGoneGraceHours", options.Detect.RootGoneGraceHours, 0, 24 * 365);
        DaemonOptionsRules.Check(errors, options.Daemon);
        QueueOptionsRules.Check(errors, options.Queue);
        Range(errors, "Query:MaxCharacters", options.Query.MaxCharacters, 1, 100_000);
        Range(errors, "Query:MaxTerms", options.Query.MaxTerms, 1, 1024);
        Range(errors, "Query:MaxResults", options.Query.MaxResults, 1, 10_000);
        Range(errors, "Query:MinimumTokenSimilarity", options.Query.MinimumTokenSimilarity, 0, 1);
        Range(errors, "Query:RetrainBelowRecall", options.Query.RetrainBelowRecall, 0, 1);
        Range(errors, "Query:RetrainAfterAddedShare", options.Query.RetrainAfterAddedShare, 0, 10);
        if (options.Query.Candidates is not ("all" or "graph" or "centroids"))
        {
            errors.Add($"Query:Candidates: '{options.Query.Candidates}' is not a candidate source; use all, graph or centroids.");
        }

        CheckSchedule(errors, options.Schedule);
        var drift = options.Drift;
        Range(errors, "Drift:CanaryPages", drift.CanaryPages, 0, 10_000);
        Range(errors, "Drift:CanaryMinimumMeanCosine", drift.CanaryMinimumMeanCosine, 0, 1);
        Range(errors, "Drift:CanaryMinimumCosine", drift.CanaryMinimumCosine, -1, 1);
        if (drift.CanaryMinimumCosine > drift.CanaryMinimumMeanCosine)
        {
            errors.Add($"Drift:CanaryMinimumCosine: {drift.CanaryMinimumCosine} is above Drift:CanaryMinimumMeanCosine ({drift.CanaryMinimumMeanCosine}); the bound on one vector must not be stricter than the bound on the mean.");
        }

        Range(errors, "Drift:CanaryIntervalHours", drift.CanaryIntervalHours, 0.01, 24 * 365);
        return errors;
    }

    private static void CheckSchedule(List<string> errors, ScheduleOptions schedule)
    {
        if (ScheduleSetup.ZoneProblem(schedule.TimeZone) is { } zoneProblem)
        {
            errors.Add($"Schedule:TimeZone: {zoneProblem}");
        }

        for (var i = 0; i < schedule.Windows.Count; i++)
        {
            if (WindowCalendar.ProblemOf(schedule.Windows[i]) is { } why)
            {
                errors.Add($"Schedule:Windows:{i}: '{schedule.Windows[i]}' is not a window: {why}.");
            }
        }

        Range(errors, "Schedule:BudgetPagesPerHour", schedule.BudgetPagesPerHour, 0, 10_000_000);
    }

    private static void CheckGlobs(List<string> errors, string at, List<string> globs)
    {
        for (var i = 0; i < globs.Count; i++)
        {
            var glob = globs[i];
            if (string.IsNullOrWhiteSpace(glob) || Path.IsPathRooted(glob) || glob.Split('/', '\\').Contains(".."))
            {
                errors.Add($"{at}:{i}: '{glob}' is not allowed; a glob is relative to its root, without '..' (e.g. **/*.pdf).");
            }
        }
    }

    internal static void Range(List<string> errors, string name, double value, double min, double max)
    {
        if (double.IsNaN(value) || value < min || value > max)
        {
            errors.Add($"{name}: {value} is out of range; allowed {min} to {max}.");
        }
    }

    private static bool IsSameOrInside(string candidate, string folder)
    {
        var inner = Path.TrimEndingDirectorySeparator(Path.GetFullPath(candidate)) + Path.DirectorySeparatorChar;
        var outer = Path.TrimEndingDirectorySeparator(Path.GetFullPath(folder)) + Path.DirectorySeparatorChar;
        var comparison = OperatingSystem.IsWindows() ? StringComparison.OrdinalIgnoreCase : StringComparison.Ordinal;
        return inner.StartsWith(outer, comparison);
    }
}
