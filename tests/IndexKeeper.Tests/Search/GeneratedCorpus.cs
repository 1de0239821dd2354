using IndexKeeper.Core.Documents;
using IndexKeeper.Tests.Encoding;
using VectorSet = IndexKeeper.Core.Encoding.VectorSet;

namespace IndexKeeper.Tests.Search;

/// <summary>
/// Generated pages with structure like real ones: each page draws its vectors around a few of a shared
/// pool of topic directions; a query takes noisy tokens from the topics of one target page.
/// </summary>
internal sealed class GeneratedCorpus
{
    private readonly float[][] topics;
    private readonly int[][] pageTopics;
    private readonly Random random;

    public GeneratedCorpus(int pages, int dimensions, int seed, int topicCount = 256, int topicsPerPage = 6, int minVectors = 20, int maxVectors = 60)
    {
        random = new Random(seed);
        Dimensions = dimensions;
        topics = Enumerable.Range(0, topicCount).Select(_ => VectorPoolingTests.Unit(VectorPoolingTests.Gaussian(random, dimensions))).ToArray();
        pageTopics = new int[pages][];
        Pages = new VectorSet[pages];
        Keys = new PageKey[pages];
        for (var p = 0; p < pages; p++)
        {
            pageTopics[p] = Enumerable.Range(0, topicsPerPage).Select(_ => random.Next(topicCount)).ToArray();
            var count = random.Next(minVectors, maxVectors + 1);
            var vectors = new float[count * dimensions];
            var regions = new PageBox[count];
            for (var v = 0; v < count; v++)
            {
                Noisy(topics[pageTopics[p][random.Next(topicsPerPage)]], 0.8).CopyTo(vectors, v * dimensions);
                regions[v] = new PageBox(v, p, v + 1, p + 1);
            }

            Pages[p] = new VectorSet(dimensions, vectors, regions);
            Keys[p] = PageKey.Of(BitConverter.GetBytes((long)p));
        }
    }

    public int Dimensions { get; }

    public VectorSet[] Pages { get; }

    public PageKey[] Keys { get; }

    public VectorSet Query(int targetPage, int tokens)
    {
        var vectors = new float[tokens * Dimensions];
        for (var t = 0; t < tokens; t++)
        {
            Noisy(topics[pageTopics[targetPage][random.Next(pageTopics[targetPage].Length)]], 1.0).CopyTo(vectors, t * Dimensions);
        }

        return new VectorSet(Dimensions, vectors, new PageBox[tokens]);
    }

    public Core.Search.InMemoryVectorSetSource Source()
    {
        var source = new Core.Search.InMemoryVectorSetSource();
        for (var p = 0; p < Pages.Length; p++)
        {
            source.Add(Keys[p], Pages[p]);
        }

        return source;
    }

    // A unit vector at a random angle from the direction; noise is the expected norm of the added Gaussian part.
    private float[] Noisy(float[] direction, double noise)
    {
        var scale = noise / Math.Sqrt(Dimensions);
        var vector = new float[Dimensions];
        double squares = 0;
        for (var i = 0; i < vector.Length; i++)
        {
            vector[i] = direction[i] + (float)(scale * VectorPoolingTests.Normal(random));
            squares += (double)vector[i] * vector[i];
        }

        var inverse = 1 / Math.Sqrt(squares);
        for (var i = 0; i < vector.Length; i++)
        {
            vector[i] = (float)(vector[i] * inverse);
        }

        return vector;
    }
}
