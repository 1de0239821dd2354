using IndexKeeper.Core.Encoding.PageImages;

namespace IndexKeeper.Tests.Encoding.PageImages;

/// <summary>
/// The tests' own late-interaction graphs and vocabulary, written once into a scratch folder: a page graph
/// that cuts a 128×160 input into 32×32 patches projected to 128-d, and a query graph that looks token ids
/// up in a table. Weights come from a fixed sequence, so the C# reference below can recompute every vector.
/// </summary>
public sealed class PageImageModels : IDisposable
{
    public const int Width = 128;
    public const int Height = 160;
    public const int Patch = 32;
    public const int Dimensions = 128;
    public const string PageInput = "pixels";
    public const string PageOutput = "patch_vectors";
    public const string QueryInput = "token_ids";
    public const string QueryOutput = "token_vectors";

    /// <summary>A WordPiece vocabulary of our own: the four BERT control tokens, then words of the invented water utility.</summary>
    public static readonly string[] Vocabulary =
        ["[PAD]", "[UNK]", "[CLS]", "[SEP]", "[MASK]", "pump", "station", "valve", "reservoir", "pressure", "main", "burst", "##s", "north", "intake"];

    public PageImageModels()
    {
        Folder = Directory.CreateTempSubdirectory("indexkeeper-page-image-").FullName;
        Weights = Sequence(Dimensions * 3 * Patch * Patch, 1);
        Bias = Sequence(Dimensions, 2);
        Table = Sequence(Vocabulary.Length * Dimensions, 3);
        PageModel = Path.Combine(Folder, "page.onnx");
        QueryModel = Path.Combine(Folder, "query.onnx");
        VocabularyFile = Path.Combine(Folder, "vocab.txt");
        File.WriteAllBytes(PageModel, OnnxModels.PatchGraph(Width, Height, Patch, Dimensions, Weights, Bias, PageInput, PageOutput));
        File.WriteAllBytes(QueryModel, OnnxModels.GatherGraph(Table, Dimensions, QueryInput, QueryOutput));
        File.WriteAllLines(VocabularyFile, Vocabulary);
    }

    public string Folder { get; }

    public string PageModel { get; }

    public string QueryModel { get; }

    public string VocabularyFile { get; }

    /// <summary>Convolution weights [d, 3, p, p].</summary>
    public float[] Weights { get; }

    public float[] Bias { get; }

    /// <summary>Query embedding table [vocabulary, d].</summary>
    public float[] Table { get; }

    public PageImageEncoderOptions Options() => new()
    {
        PageModel = PageModel,
        PageInput = PageInput,
        PageOutput = PageOutput,
        InputWidth = Width,
        InputHeight = Height,
        PatchSize = Patch,
        PixelMean = [0.48, 0.46, 0.41],
        PixelStd = [0.27, 0.26, 0.28],
        QueryModel = QueryModel,
        QueryInput = QueryInput,
        QueryOutput = QueryOutput,
        QueryVocabulary = VocabularyFile,
        Dimensions = Dimensions,
    };

    /// <summary>
    /// The page graph recomputed in plain C#: for patch (r, c) and output k,
    /// bias[k] + Σ over channel, i, j of weight[k, channel, i, j] · input[channel, r·p + i, c·p + j]
    /// (the ONNX Conv operator with stride = kernel, no padding, no dilation), then L2-normalised.
    /// </summary>
    public float[] ReferencePatchVectors(float[] input)
    {
        var columns = Width / Patch;
        var rows = Height / Patch;
        var result = new float[rows * columns * Dimensions];
        for (var r = 0; r < rows; r++)
        {
            for (var c = 0; c < columns; c++)
            {
                var row = new double[Dimensions];
                for (var k = 0; k < Dimensions; k++)
                {
                    double sum = Bias[k];
                    for (var channel = 0; channel < 3; channel++)
                    {
                        for (var i = 0; i < Patch; i++)
                        {
                            for (var j = 0; j < Patch; j++)
                            {
                                sum += Weights[(((((k * 3) + channel) * Patch) + i) * Patch) + j] * (double)input[(channel * Width * Height) + (((r * Patch) + i) * Width) + (c * Patch) + j];
                            }
                        }
                    }

                    row[k] = sum;
                }

                var norm = Math.Sqrt(row.Sum(v => v * v));
                for (var k = 0; k < Dimensions; k++)
                {
                    result[(((r * columns) + c) * Dimensions) + k] = (float)(row[k] / norm);
                }
            }
        }

        return result;
    }

    public void Dispose() => Directory.Delete(Folder, recursive: true);

    // Small weights from a fixed linear congruential sequence (Numerical Recipes constants), centred on 0.
    internal static float[] Sequence(int count, uint seed)
    {
        var state = seed;
        var values = new float[count];
        for (var i = 0; i < count; i++)
        {
            state = (state * 1664525u) + 1013904223u;
            values[i] = ((state >> 8) / (float)(1 << 24)) - 0.5f;
        }

        return values;
    }
}
