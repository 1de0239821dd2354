using System.Diagnostics;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Encoding.TextTokens;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// Encoder throughput on text pages of ~400 words (the invented water utility's vocabulary): pages/s and
/// ms/page of the hashed-term encoder and of the text-token encoder with 1 and 2 intra-op threads, and for
/// the latter the share of wall time spent outside the model runs (tokenising, windowing, projecting,
/// copying); the goal is at most 10 %.
/// </summary>
public sealed class EncoderBenchmark : IBenchmark
{
    private const int WordsPerPage = 400;
    private const int BatchSize = 8;

    private static readonly string[] Vocabulary =
    [
        "Harrowmere", "Water", "Authority", "reservoir", "pump", "station", "valve", "pressure", "main", "burst",
        "treatment", "works", "chlorine", "dose", "turbidity", "sample", "district", "meter", "customer", "supply",
        "inspection", "report", "maintenance", "schedule", "filter", "sludge", "intake", "outfall", "catchment", "rainfall",
        "the", "of", "and", "to", "in", "was", "for", "on", "at", "with", "after", "before", "during", "each", "all",
        "engineers", "replaced", "checked", "recorded", "measured", "closed", "opened", "raised", "lowered", "flushed",
        "2024", "litres", "per", "second", "metres", "kPa", "mg/L", "north", "south", "east", "west", "No.", "4,",
    ];

    public string Name => "encoders";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var pages = Pages(context.Quick ? 8 : 48);
        context.Note($"{pages.Length} pages of {WordsPerPage} words, batches of {BatchSize}, {Environment.ProcessorCount} cores");

        var hashed = HashedTermEncoderFactory.Create(new HashedTermEncoderOptions());
        Measure(context, "hashed-terms", hashed, pages, modelTime: null);

        foreach (var threads in new[] { 1, 2 })
        {
            var started = Stopwatch.GetTimestamp();
            var encoder = TextTokenEncoderFactory.Create(new TextTokenEncoderOptions { IntraOpThreads = threads });
            context.Report($"minilm load (model, session, id) {threads} thread(s)", Stopwatch.GetElapsedTime(started).TotalSeconds, "s");
            using ((IDisposable)encoder)
            {
                var textTokens = (TextTokenEncoder)encoder;
                var tokens = pages.Take(1).Sum(p => p.Words.Sum(w => textTokens.TokenIds(w.Text).Count));
                if (threads == 1)
                {
                    context.Note($"a page is {tokens} word-piece tokens");
                }

                textTokens.EncodePages(pages.Take(1).ToArray(), CancellationToken.None); // warm-up
                Measure(context, $"minilm {threads} thread(s)", encoder, pages, () => textTokens.ModelTime);
            }
        }

        PageImageEncoderFigures.Run(context, BatchSize);
    }

    private static void Measure(BenchmarkContext context, string label, IPageEncoder encoder, PageToEncode[] pages, Func<TimeSpan>? modelTime)
    {
        var modelBefore = modelTime?.Invoke() ?? TimeSpan.Zero;
        var cpuBefore = Process.GetCurrentProcess().TotalProcessorTime;
        var started = Stopwatch.GetTimestamp();
        for (var first = 0; first < pages.Length; first += BatchSize)
        {
            encoder.EncodePages(pages.Skip(first).Take(BatchSize).ToArray(), CancellationToken.None);
        }

        var wall = Stopwatch.GetElapsedTime(started);
        var cpu = Process.GetCurrentProcess().TotalProcessorTime - cpuBefore;
        context.Report($"{label} pages/s", pages.Length / wall.TotalSeconds, "pages/s");
        context.Report($"{label} ms/page", wall.TotalMilliseconds / pages.Length, "ms");
        context.Report($"{label} CPU ms/page", cpu.TotalMilliseconds / pages.Length, "ms");
        if (modelTime is not null)
        {
            var inModel = modelTime() - modelBefore;
            context.Report($"{label} share outside the model", 100.0 * (1.0 - (inModel / wall)), "%");
        }
    }

    // Deterministic pseudo-text: words drawn from the vocabulary by a fixed linear congruential sequence.
    private static PageToEncode[] Pages(int count)
    {
        var state = 12345u;
        var result = new PageToEncode[count];
        for (var p = 0; p < count; p++)
        {
            var words = new PageWord[WordsPerPage];
            for (var w = 0; w < WordsPerPage; w++)
            {
                state = (state * 1664525u) + 1013904223u;
                var line = w / 12;
                var column = w % 12;
                words[w] = new PageWord(Vocabulary[(state >> 8) % (uint)Vocabulary.Length], new PageBox(40f + (45f * column), 800f - (14f * line), 80f + (45f * column), 810f - (14f * line)));
            }

            result[p] = new PageToEncode(PageKey.Of(BitConverter.GetBytes(p)), "bench.pdf", p + 1, 595f, 842f, words);
        }

        return result;
    }
}
