using System.CommandLine;
using System.Globalization;
using IndexKeeper.Core.Drift;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// <c>encoders [--check-canaries]</c>: every encoder id in the index with its vector-set counts, whether it is
/// active (configured) or serving (ranks searches), migration progress and the last canary figures.
/// <c>--check-canaries</c> re-embeds the canary pages with the active encoder first (docs/encoders.md).
/// </summary>
internal sealed class EncodersCommand() : CommandBase(
    "encoders",
    "encoder ids in the index: counts, active/serving, migration, canaries; --check-canaries checks now")
{
    private readonly Option<bool> checkCanaries = new("--check-canaries")
    {
        Description = "re-embed the canary pages with the active encoder now and compare (exit 1 when they drifted); needs the roots",
    };

    public override IEnumerable<Symbol> Symbols => [checkCanaries];

    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var check = context.Value(checkCanaries);

        // A canary check re-embeds pages, and an image encoder draws them from their files under the roots.
        // Without a check nothing is written: the index is opened for reading only.
        var options = context.LoadForExistingIndex(rootsRequired: check);
        using var composed = check ? CommandContext.Open(options, Name) : CommandContext.OpenForReading(options);
        var encoders = composed.Get<EncodersOperation>();
        CanaryFigures? figures = check ? encoders.CheckCanaries(cancellationToken) : null;

        // Silent drift found now is a problem found, as verify reports one.
        return context.Print(encoders.Read(check), Write, figures is { Drifted: true } ? 1 : 0);
    }

    private static void Write(TextWriter o, EncodersReport report)
    {
        var c = CultureInfo.InvariantCulture;
        o.WriteLine(string.Create(c, $"{"encoder id",-14} {"name",-13} {"d",4} {"live",8} {"total",8}  role"));
        foreach (var e in report.Encoders)
        {
            var roles = new List<string>();
            if (e.Serving)
            {
                roles.Add("serving");
            }

            if (e.Active)
            {
                roles.Add("active");
            }

            if (e.Retired)
            {
                roles.Add("retired");
            }

            o.WriteLine(string.Create(c, $"{e.Id[..12] + "…",-14} {e.Name,-13} {e.Dimensions,4} {e.LiveVectorSets,8} {e.VectorSets,8}  {string.Join(", ", roles)}"));
            if (e.PagesToMigrate is { } toMigrate)
            {
                o.WriteLine(string.Create(c, $"{string.Empty,15}migration: {e.PagesMigrated} of {toMigrate} page(s) migrated"));
            }

            if (e.PagesDrifted is { } drifted)
            {
                o.WriteLine(string.Create(c, $"{string.Empty,15}drifted: {drifted} page(s) served by it still wait for the active encoder (queued at migration priority)"));
            }

            if (e.Canary is { } canary)
            {
                o.WriteLine(string.Create(c, $"{string.Empty,15}canaries {(canary.Drifted ? "DRIFTED" : "ok")}: {canary.Pages} page(s), {canary.Vectors} vectors, mean cosine {canary.MeanCosine:0.000000}, minimum {canary.MinimumCosine:0.000000}, {canary.CheckedUtc:yyyy-MM-dd HH:mm:ss'Z'}"));
            }

            o.WriteLine(string.Create(c, $"{string.Empty,15}{e.Description}"));
        }

        if (report.Migrating)
        {
            o.WriteLine(string.Create(c, $"A migration is in progress: searches rank with the serving encoder until all {report.PagesDrifted + report.PagesMigrated} page(s) have vectors of the active one; run sync."));
        }
    }
}
