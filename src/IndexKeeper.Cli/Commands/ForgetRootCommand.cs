using System.CommandLine;
using System.Globalization;
using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// <c>forget-root NAME [--yes]</c>: removes from the index every document kept under a root name no setting
/// names any more (a renamed or retired root: nothing else ever removes those, docs/cli.md "Root names").
/// Without <c>--yes</c> it only says what it would remove, reading the index read-only. A name the settings
/// still give is refused (the next pass would find its files again and read them anew), as is a name the
/// index does not know; both exit 2 with nothing changed.
/// </summary>
internal sealed class ForgetRootCommand() : CommandBase(
    "forget-root",
    "remove the documents of a root name the settings no longer give (after a rename); without --yes only shows what it would remove")
{
    private readonly Argument<string> name = new("name")
    {
        Description = "the root name, as status lists it",
    };

    private readonly Option<bool> yes = new("--yes")
    {
        Description = "remove them; without it nothing is changed",
    };

    public override IEnumerable<Symbol> Symbols => [name, yes];

    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var root = context.Value(name) ?? string.Empty;
        var options = context.LoadForExistingIndex();
        if (options.Roots.Any(r => string.Equals(r.Name, root, StringComparison.Ordinal)))
        {
            throw new UsageException(
                $"'{root}' is a root the settings give: a pass would walk it and read its files again. Take it out of the settings (or --root) first; nothing was changed.");
        }

        ForgetRootReport report;
        if (!context.Value(yes))
        {
            using var reading = CommandContext.OpenForReading(options);
            var preview = reading.Get<ForgetRootOperation>().Preview(root, cancellationToken);
            RequireKnown(reading, root, preview.Documents);
            report = new ForgetRootReport(root, preview.Documents, preview.PagesRemoved, preview.PagesKept, Forgotten: false);
        }
        else
        {
            using var composed = CommandContext.Open(options, Name);
            var forget = composed.Get<ForgetRootOperation>();
            var preview = forget.Preview(root, cancellationToken);
            RequireKnown(composed, root, preview.Documents);
            var summary = forget.Run(Name, root, cancellationToken);
            report = new ForgetRootReport(root, summary.DocumentsDeleted, summary.PagesRemoved, preview.PagesKept, Forgotten: true);
        }

        return context.Print(report, Write);
    }

    private static void RequireKnown(IndexComposition composed, string root, long documents)
    {
        if (documents > 0)
        {
            return;
        }

        var known = composed.Index.Catalog.Documents.TotalsByRoot();
        throw new UsageException(
            $"The index keeps no documents under the root name '{root}'" +
            (known.Count == 0 ? "." : "; it has " + string.Join(", ", known.Select(t => string.Create(CultureInfo.InvariantCulture, $"'{t.Root}' ({t.LiveDocuments + t.QuarantinedDocuments} document(s))"))) + "."));
    }

    private static void Write(TextWriter o, ForgetRootReport r)
    {
        var c = CultureInfo.InvariantCulture;
        var verb = r.Forgotten ? "removed" : "would be removed";
        o.WriteLine(string.Create(c, $"Root '{r.Root}': {r.Documents} document(s) {verb}."));
        o.WriteLine(string.Create(c, $"  {r.PagesRemoved} page(s) only they hold {verb}; their vectors become dead and compaction reclaims the space."));
        o.WriteLine(string.Create(c, $"  {r.PagesKept} page(s) documents of other roots hold too are kept, with their vectors."));
        o.WriteLine(r.Forgotten ? "Done." : "Nothing was changed; add --yes to remove them.");
    }
}
