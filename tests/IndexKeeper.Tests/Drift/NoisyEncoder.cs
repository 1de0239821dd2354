using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Tests.Drift;

/// <summary>
/// An encoder that claims another encoder's identity but adds seeded noise to every vector (then normalises
/// again): what silent drift looks like — the same declared id, different numbers.
/// </summary>
internal sealed class NoisyEncoder(IPageEncoder inner, double noise, int seed) : IPageEncoder
{
    private readonly Random random = new(seed);

    public EncoderIdentity Identity => inner.Identity;

    public IReadOnlyList<VectorSet> EncodePages(IReadOnlyList<PageToEncode> pages, CancellationToken cancellationToken) =>
        inner.EncodePages(pages, cancellationToken).Select(Perturb).ToList();

    public VectorSet EncodeQuery(string text, CancellationToken cancellationToken) => Perturb(inner.EncodeQuery(text, cancellationToken));

    private VectorSet Perturb(VectorSet set)
    {
        var values = (float[])set.Vectors.Clone();
        for (var row = 0; row < set.Count; row++)
        {
            var span = values.AsSpan(row * set.Dimensions, set.Dimensions);
            double norm = 0;
            for (var i = 0; i < span.Length; i++)
            {
                span[i] += (float)((random.NextDouble() - 0.5) * 2 * noise);
                norm += span[i] * span[i];
            }

            for (var i = 0; i < span.Length; i++)
            {
                span[i] = (float)(span[i] / Math.Sqrt(norm));
            }
        }

        return new VectorSet(set.Dimensions, values, set.Regions);
    }
}
