using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;
using UglyToad.PdfPig.Content;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Fonts.Standard14Fonts;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// The default encoder end to end on the real executable (issue 4, "done when"): a configuration that names
/// no encoder embeds with minilm, <c>encoders --json</c> shows it serving, and a search phrased in other words
/// than a page's own finds that page above unrelated ones. Sentences are our own (invented scenario).
/// </summary>
public sealed class DefaultEncoderTests : IDisposable
{
    private static readonly (string Query, string Page)[] Pairs =
    [
        ("burst water main flooding the road", "A broken pipe under the street sent water across the carriageway."),
        ("chlorine dose at the treatment works", "Operators adjusted how much disinfectant is added at the purification plant."),
        ("unpaid bills and late payment", "Customers who have not settled their invoices on time will be charged a fee."),
        ("reservoir nearly empty after drought", "Months without rain left the storage lake almost dry."),
    ];

    private readonly CliIndex index = new("store") { ShippedEncoder = true };

    [Fact]
    public void Sync_embeds_with_minilm_by_default_and_search_ranks_paraphrases_first()
    {
        index.Put("store/notes/bulletin.pdf", Bulletin());

        var sync = index.Json("sync");
        ContractAssert.Counts(sync, "sync", ("pagesEmbedded", Pairs.Length));
        var encoders = index.Json("encoders");
        var entry = Assert.Single(encoders.GetProperty("encoders").EnumerateArray());
        Assert.Equal("minilm", entry.GetProperty("name").GetString());
        Assert.True(entry.GetProperty("serving").GetBoolean());
        Assert.Equal(Pairs.Length, entry.GetProperty("liveVectorSets").GetInt64());

        // The ranking of every query, through the search command's use case (one model load).
        var options = OptionsLoader.Load(new ConfigurationSources(null, index.PathOf("index"), [index.PathOf("store")], []));
        using (var session = IndexComposition.Open(options, "default encoder test"))
        {
            for (var q = 0; q < Pairs.Length; q++)
            {
                var report = session.Get<SearchOperation>().Search(Pairs[q].Query, 4, CancellationToken.None);
                Assert.StartsWith("minilm ", report.Encoder, StringComparison.Ordinal);
                Assert.Equal(q + 1, report.Hits[0].Page);
            }
        }

        var cli = index.Json("search", Pairs[0].Query, "-k", "4");
        Assert.Equal(1, cli.GetProperty("hits")[0].GetProperty("page").GetInt32());
    }

    public void Dispose() => index.Dispose();

    private static byte[] Bulletin()
    {
        using var builder = new PdfDocumentBuilder();
        var font = builder.AddStandard14Font(Standard14Font.Helvetica);
        foreach (var (_, text) in Pairs)
        {
            builder.AddPage(PageSize.A4).AddText(text, 11, new PdfPoint(72, 760), font);
        }

        return builder.Build();
    }
}
