using System.Diagnostics;
using IndexKeeper.Core.Documents;
using Microsoft.ML.OnnxRuntime;
using Microsoft.ML.Tokenizers;

namespace IndexKeeper.Core.Encoding.TextTokens;

/// <summary>
/// The text-token encoder (docs/encoders.md): word-piece tokens of a page's words run through the pretrained
/// sentence encoder on the CPU in windows; each token's last hidden state, taken from the window where the
/// token is most central, is projected to d and L2-normalised, and keeps the box of its word.
/// Windows of equal length from all pages of a batch share a model run (no padding, so a page's vectors do
/// not depend on what it was batched with).
/// </summary>
internal sealed class TextTokenEncoder : IPageEncoder, IDisposable
{
    private const long ClassificationId = 101; // [CLS] in the uncased vocabulary (line 102 of vocab.txt)
    private const long SeparatorId = 102; // [SEP] in the uncased vocabulary (line 103 of vocab.txt)
    private const string StatesOutput = "last_hidden_state";
    private static readonly string[] InputNames = ["input_ids", "attention_mask", "token_type_ids"];
    private static readonly string[] OutputNames = [StatesOutput];

    private readonly InferenceSession session;
    private readonly RunOptions runOptions = new();
    private readonly BertTokenizer tokenizer;
    private readonly SeededProjection projection;
    private readonly int capacity;
    private readonly int overlap;
    private readonly int poolFactor;
    private readonly int maxWindowsPerRun;
    private long modelTicks;

    public TextTokenEncoder(EncoderIdentity identity, InferenceSession session, BertTokenizer tokenizer, SeededProjection projection, TextTokenEncoderOptions options)
    {
        Identity = identity;
        this.session = session;
        this.tokenizer = tokenizer;
        this.projection = projection;
        capacity = options.MaxSequenceLength - 2;
        overlap = options.WindowOverlap;
        poolFactor = options.PoolFactor;
        maxWindowsPerRun = options.MaxWindowsPerRun;
    }

    public EncoderIdentity Identity { get; }

    /// <summary>Wall time spent inside model runs since creation (for the benchmark's share outside the model).</summary>
    internal TimeSpan ModelTime => Stopwatch.GetElapsedTime(0, Interlocked.Read(ref modelTicks));

    public IReadOnlyList<VectorSet> EncodePages(IReadOnlyList<PageToEncode> pages, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pages);
        var cache = new Dictionary<string, int[]>(StringComparer.Ordinal);
        var sequences = new WordPieceSequence[pages.Count];
        for (var p = 0; p < pages.Count; p++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            sequences[p] = WordPieceSequence.Create(tokenizer, pages[p].Words, cache);
        }

        var vectors = Embed(sequences, cancellationToken);
        var result = new VectorSet[pages.Count];
        for (var p = 0; p < pages.Count; p++)
        {
            var words = pages[p].Words;
            var regions = sequences[p].Words.Select(w => words[w].Box).ToArray();
            var set = new VectorSet(projection.OutputSize, vectors[p], regions);
            result[p] = poolFactor > 1 ? VectorPooling.Pool(set, poolFactor) : set;
        }

        return result;
    }

    public VectorSet EncodeQuery(string text, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(text);
        cancellationToken.ThrowIfCancellationRequested();
        var words = text.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries);
        var sequence = WordPieceSequence.Create(tokenizer, words, new Dictionary<string, int[]>(StringComparer.Ordinal));
        var vectors = Embed([sequence], cancellationToken)[0];
        return new VectorSet(projection.OutputSize, vectors, new PageBox[sequence.Count]);
    }

    /// <summary>
    /// The model's last hidden states (rows of the hidden size) for one window of token ids, [CLS] and [SEP]
    /// added around them; row 0 is [CLS]. The raw path that projection starts from, for checks against a reference.
    /// </summary>
    internal float[] HiddenStates(IReadOnlyList<int> ids)
    {
        var window = new long[ids.Count + 2];
        window[0] = ClassificationId;
        for (var i = 0; i < ids.Count; i++)
        {
            window[i + 1] = ids[i];
        }

        window[^1] = SeparatorId;
        var states = new float[window.Length * projection.InputSize];
        Run(window, 1, window.Length, (_, rowStates) => rowStates.CopyTo(states));
        return states;
    }

    /// <summary>The word-piece ids of a text as this encoder tokenises it (no [CLS]/[SEP]).</summary>
    internal IReadOnlyList<int> TokenIds(string text) => WordPieceSequence.Tokenize(tokenizer, text);

    public void Dispose()
    {
        runOptions.Dispose();
        session.Dispose();
    }

    private float[][] Embed(WordPieceSequence[] sequences, CancellationToken cancellationToken)
    {
        var d = projection.OutputSize;
        var vectors = new float[sequences.Length][];
        var jobsByLength = new SortedDictionary<int, List<(int Page, int Window, TokenWindowPlan Plan)>>();
        for (var p = 0; p < sequences.Length; p++)
        {
            vectors[p] = new float[sequences[p].Count * d];
            var plan = TokenWindowPlan.Create(sequences[p].Count, capacity, overlap);
            for (var w = 0; w < plan.Windows.Count; w++)
            {
                var length = plan.Windows[w].Length;
                if (!jobsByLength.TryGetValue(length, out var jobs))
                {
                    jobs = [];
                    jobsByLength[length] = jobs;
                }

                jobs.Add((p, w, plan));
            }
        }

        foreach (var (length, jobs) in jobsByLength)
        {
            var width = length + 2;
            for (var first = 0; first < jobs.Count; first += maxWindowsPerRun)
            {
                cancellationToken.ThrowIfCancellationRequested();
                var batch = jobs.GetRange(first, Math.Min(maxWindowsPerRun, jobs.Count - first));
                var ids = new long[batch.Count * width];
                for (var b = 0; b < batch.Count; b++)
                {
                    var (page, window, plan) = batch[b];
                    var span = plan.Windows[window];
                    ids[b * width] = ClassificationId;
                    sequences[page].Ids.AsSpan(span.Start, span.Length).CopyTo(ids.AsSpan((b * width) + 1));
                    ids[(b * width) + width - 1] = SeparatorId;
                }

                Run(ids, batch.Count, width, (b, rowStates) =>
                {
                    var (page, window, plan) = batch[b];
                    var span = plan.Windows[window];
                    for (var t = span.Start; t < span.End; t++)
                    {
                        if (plan.WindowOfToken[t] == window)
                        {
                            var state = rowStates.Slice((1 + t - span.Start) * projection.InputSize, projection.InputSize);
                            projection.ProjectNormalised(state, vectors[page].AsSpan(t * d, d));
                        }
                    }
                });
            }
        }

        return vectors;
    }

    private delegate void RowStates(int row, ReadOnlySpan<float> states);

    // One model run over `rows` windows of `width` tokens (no padding: every attention mask entry is 1).
    private void Run(long[] ids, int rows, int width, RowStates onRow)
    {
        long[] shape = [rows, width];
        var mask = new long[ids.Length];
        Array.Fill(mask, 1L);
        var types = new long[ids.Length];
        using var idsValue = OrtValue.CreateTensorValueFromMemory(ids, shape);
        using var maskValue = OrtValue.CreateTensorValueFromMemory(mask, shape);
        using var typesValue = OrtValue.CreateTensorValueFromMemory(types, shape);
        var started = Stopwatch.GetTimestamp();
        using var outputs = session.Run(runOptions, InputNames, [idsValue, maskValue, typesValue], OutputNames);
        Interlocked.Add(ref modelTicks, Stopwatch.GetTimestamp() - started);
        var states = outputs[0].GetTensorDataAsSpan<float>();
        var rowLength = width * projection.InputSize;
        for (var r = 0; r < rows; r++)
        {
            onRow(r, states.Slice(r * rowLength, rowLength));
        }
    }
}
