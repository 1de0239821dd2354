using System.Numerics.Tensors;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// Pages whose vectors lie around a few of a shared pool of topic directions, and queries whose tokens
/// come from the topics of one page: structure like real patch and token embeddings, made up.
/// </summary>
internal sealed class TopicCorpus
{
    private const int TopicCount = 4096;
    private const int TopicsPerPage = 40;
    private readonly Random random;
    private readonly float[][] topics;
    private readonly List<int[]> pageTopics = [];
    private readonly int dimensions;
    private readonly int minVectors;
    private readonly int maxVectors;
    private readonly int queryTokens;

    /// <param name="minVectors">Fewest vectors of a page; each page draws its count evenly from this to <paramref name="maxVectors"/>.</param>
    public TopicCorpus(int seed, int dimensions, int minVectors, int maxVectors, int queryTokens)
    {
        random = new Random(seed);
        this.dimensions = dimensions;
        this.minVectors = minVectors;
        this.maxVectors = maxVectors;
        this.queryTokens = queryTokens;
        topics = Enumerable.Range(0, TopicCount).Select(_ => Around(new float[dimensions], 1)).ToArray();
    }

    public VectorSet Page(out int index)
    {
        var chosen = Enumerable.Range(0, TopicsPerPage).Select(_ => random.Next(TopicCount)).ToArray();
        index = pageTopics.Count;
        pageTopics.Add(chosen);
        var count = minVectors == maxVectors ? minVectors : random.Next(minVectors, maxVectors + 1);
        var vectors = new float[count * dimensions];
        var regions = new PageBox[count];
        for (var v = 0; v < count; v++)
        {
            Around(topics[chosen[random.Next(chosen.Length)]], 0.8).CopyTo(vectors, v * dimensions);
            regions[v] = new PageBox(v % 32 * 18, v / 32 * 26, (v % 32 * 18) + 18, (v / 32 * 26) + 26);
        }

        return new VectorSet(dimensions, vectors, regions);
    }

    public VectorSet Query(int page)
    {
        var chosen = pageTopics[page];
        var vectors = new float[queryTokens * dimensions];
        for (var t = 0; t < queryTokens; t++)
        {
            Around(topics[chosen[random.Next(chosen.Length)]], 1.0).CopyTo(vectors, t * dimensions);
        }

        return new VectorSet(dimensions, vectors, new PageBox[queryTokens]);
    }

    // A unit vector near the direction: direction plus Gaussian noise of expected norm `noise`, renormalised.
    private float[] Around(float[] direction, double noise)
    {
        var vector = new float[dimensions];
        var scale = noise / Math.Sqrt(dimensions);
        for (var i = 0; i < dimensions; i += 2)
        {
            // Box–Muller transform gives two normal deviates (common practice).
            var radius = Math.Sqrt(-2 * Math.Log(1 - random.NextDouble()));
            var angle = 2 * Math.PI * random.NextDouble();
            vector[i] = direction[i] + (float)(scale * radius * Math.Cos(angle));
            vector[i + 1] = direction[i + 1] + (float)(scale * radius * Math.Sin(angle));
        }

        var norm = (float)Math.Sqrt(TensorPrimitives.SumOfSquares(vector));
        TensorPrimitives.Divide(vector, norm, vector);
        return vector;
    }
}
