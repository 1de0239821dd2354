using System.Numerics.Tensors;

namespace IndexKeeper.Core.Search;

/// <summary>
/// Turns a set of vectors into one vector whose dot product with a query's approximates MaxSim: a fixed
/// dimensional encoding after Dhulipala, Hadian, Jayaram, Lee and Mirrokni, "MUVERA: Multi-Vector Retrieval via
/// Fixed Dimensional Encodings" (NeurIPS 2024, arXiv:2405.19504). Per repetition, <see cref="BucketBits"/>
/// random Gaussian hyperplanes (SimHash) put each vector in one of 2^bits buckets; each vector is projected to
/// <see cref="ProjectionDimensions"/> by a random ±1 matrix; a query sums its projections per bucket, a page
/// averages them, and an empty page bucket takes the projection of the page vector whose bucket is nearest in
/// Hamming distance. The encoding depends on the vectors alone, never on the rest of the index, so adds and
/// deletes cannot degrade it (docs/search.md, "Candidates").
/// </summary>
/// <remarks>
/// The random matrices come from <see cref="Seed"/> through SplitMix64 (Steele, Lea and Flood, OOPSLA 2014) and
/// Box–Muller, not System.Random, so encodings written to disk stay valid across .NET versions. The parameters
/// reach disk (docs/serving-view.md): changing one makes every stored view stale.
/// </remarks>
internal sealed class FixedDimensionalEncoding
{
    /// <summary>Never change without a new serving-view version: stored encodings were made with it.</summary>
    public const ulong Seed = 0x1D3C_6E55_A1F0_0013;

    public const int Repetitions = 10;

    public const int BucketBits = 4;

    public const int ProjectionDimensions = 16;

    // Rows: per repetition bucketBits hyperplanes then projection rows, each Dimensions wide.
    private readonly float[] matrix;
    private readonly int repetitions;
    private readonly int bucketBits;
    private readonly int projection;
    private readonly int buckets;
    private readonly int rowsPerRepetition;

    public FixedDimensionalEncoding(int dimensions)
        : this(dimensions, Repetitions, BucketBits, ProjectionDimensions)
    {
    }

    /// <summary>Other parameters than the stored ones: for measuring them (the benchmark), never for a view.</summary>
    internal FixedDimensionalEncoding(int dimensions, int repetitions, int bucketBits, int projection)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(dimensions, 1);
        this.repetitions = repetitions;
        this.bucketBits = bucketBits;
        this.projection = projection;
        buckets = 1 << bucketBits;
        rowsPerRepetition = bucketBits + projection;
        Dimensions = dimensions;
        matrix = new float[repetitions * rowsPerRepetition * dimensions];
        var state = Seed ^ (ulong)dimensions;
        var projectionScale = 1 / MathF.Sqrt(projection);
        for (var r = 0; r < repetitions; r++)
        {
            for (var row = 0; row < rowsPerRepetition; row++)
            {
                var at = ((r * rowsPerRepetition) + row) * dimensions;
                for (var i = 0; i < dimensions; i++)
                {
                    matrix[at + i] = row < bucketBits ? Gaussian(ref state) : (SplitMix64(ref state) & 1) == 0 ? projectionScale : -projectionScale;
                }
            }
        }
    }

    public int Dimensions { get; }

    /// <summary>Length of an encoding with the stored parameters.</summary>
    public static int Length => Repetitions * (1 << BucketBits) * ProjectionDimensions;

    /// <summary>Length of an encoding with this instance's parameters.</summary>
    public int EncodedLength => repetitions * buckets * projection;

    /// <summary>The encoding of a page's rows (float16, row-major); all zero for a page without rows.</summary>
    public void EncodePage(ReadOnlySpan<Half> rows, Span<float> destination)
    {
        var count = rows.Length / Dimensions;
        var floats = new float[count * Dimensions];
        TensorPrimitives.ConvertToSingle(rows, floats);
        Encode(floats, count, destination, page: true);
    }

    /// <summary>The encoding of a query's rows (float32, row-major).</summary>
    public void EncodeQuery(ReadOnlySpan<float> rows, Span<float> destination) => Encode(rows, rows.Length / Dimensions, destination, page: false);

    private void Encode(ReadOnlySpan<float> rows, int count, Span<float> destination, bool page)
    {
        if (destination.Length != EncodedLength)
        {
            throw new ArgumentException($"The destination holds {destination.Length} values, an encoding {EncodedLength}.", nameof(destination));
        }

        destination.Clear();
        var projected = new float[count * projection];
        var bucketOf = new int[count];
        var members = new int[buckets];
        for (var r = 0; r < repetitions; r++)
        {
            var block = destination.Slice(r * buckets * projection, buckets * projection);
            Array.Clear(members);
            for (var v = 0; v < count; v++)
            {
                var row = rows.Slice(v * Dimensions, Dimensions);
                var at = r * rowsPerRepetition * Dimensions;
                var bucket = 0;
                for (var b = 0; b < bucketBits; b++)
                {
                    if (TensorPrimitives.Dot(row, matrix.AsSpan(at + (b * Dimensions), Dimensions)) > 0)
                    {
                        bucket |= 1 << b;
                    }
                }

                var projected1 = projected.AsSpan(v * projection, projection);
                for (var p = 0; p < projection; p++)
                {
                    projected1[p] = TensorPrimitives.Dot(row, matrix.AsSpan(at + ((bucketBits + p) * Dimensions), Dimensions));
                }

                bucketOf[v] = bucket;
                members[bucket]++;
                var cell = block.Slice(bucket * projection, projection);
                TensorPrimitives.Add(cell, projected1, cell);
            }

            if (!page || count == 0)
            {
                continue;
            }

            for (var bucket = 0; bucket < buckets; bucket++)
            {
                var cell = block.Slice(bucket * projection, projection);
                if (members[bucket] > 0)
                {
                    TensorPrimitives.Multiply(cell, 1f / members[bucket], cell);
                    continue;
                }

                // An empty page bucket would score every query vector that falls in it as 0; the nearest page
                // vector by bucket code stands in (MUVERA's "fill empty clusters"); the first such on ties.
                var nearest = 0;
                var nearestDistance = int.MaxValue;
                for (var v = 0; v < count; v++)
                {
                    var distance = System.Numerics.BitOperations.PopCount((uint)(bucketOf[v] ^ bucket));
                    if (distance < nearestDistance)
                    {
                        nearest = v;
                        nearestDistance = distance;
                    }
                }

                projected.AsSpan(nearest * projection, projection).CopyTo(cell);
            }
        }
    }

    private static ulong SplitMix64(ref ulong state)
    {
        var z = state += 0x9E37_79B9_7F4A_7C15;
        z = (z ^ (z >> 30)) * 0xBF58_476D_1CE4_E5B9;
        z = (z ^ (z >> 27)) * 0x94D0_49BB_1331_11EB;
        return z ^ (z >> 31);
    }

    private static float Gaussian(ref ulong state)
    {
        // Box–Muller on two uniforms in (0, 1]; the 53 high bits make a double.
        var u1 = ((SplitMix64(ref state) >> 11) + 1) * (1.0 / (1UL << 53));
        var u2 = (SplitMix64(ref state) >> 11) * (1.0 / (1UL << 53));
        return (float)(Math.Sqrt(-2 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2));
    }
}
