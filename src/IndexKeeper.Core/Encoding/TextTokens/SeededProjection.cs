using System.Numerics.Tensors;

namespace IndexKeeper.Core.Encoding.TextTokens;

/// <summary>
/// The fixed projection from the model's hidden size down to d: a d × hidden matrix of random signs
/// (±1, drawn from SplitMix64 seeded with the projection seed, row by row, one bit per entry: the top bit,
/// 0 ⇒ +1), whose rows are then made orthonormal by modified Gram–Schmidt in double precision and rounded
/// to float32. Signs and only +, ×, / and √ (all correctly rounded in IEEE 754) make the matrix the same on
/// every platform; orthonormal rows keep the geometry of the states in the subspace they span.
/// </summary>
internal sealed class SeededProjection
{
    private readonly float[] matrix;

    private SeededProjection(int outputSize, int inputSize, float[] matrix)
    {
        OutputSize = outputSize;
        InputSize = inputSize;
        this.matrix = matrix;
    }

    public int OutputSize { get; }

    public int InputSize { get; }

    public static SeededProjection Create(int outputSize, int inputSize, ulong seed)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(outputSize, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(outputSize, inputSize);
        var rows = new double[outputSize][];
        var state = seed;
        for (var r = 0; r < outputSize; r++)
        {
            var row = new double[inputSize];
            for (var c = 0; c < inputSize; c++)
            {
                row[c] = (SplitMix64.Next(ref state) >> 63) == 0 ? 1.0 : -1.0;
            }

            // Modified Gram–Schmidt: remove, one at a time, the parts along the rows already made orthonormal.
            for (var earlier = 0; earlier < r; earlier++)
            {
                var dot = 0.0;
                for (var c = 0; c < inputSize; c++)
                {
                    dot += row[c] * rows[earlier][c];
                }

                for (var c = 0; c < inputSize; c++)
                {
                    row[c] -= dot * rows[earlier][c];
                }
            }

            var squares = 0.0;
            for (var c = 0; c < inputSize; c++)
            {
                squares += row[c] * row[c];
            }

            if (squares < 1e-12)
            {
                throw new InvalidOperationException($"Projection seed {seed} gives linearly dependent rows; choose another seed.");
            }

            var scale = 1.0 / Math.Sqrt(squares);
            for (var c = 0; c < inputSize; c++)
            {
                row[c] *= scale;
            }

            rows[r] = row;
        }

        var matrix = new float[outputSize * inputSize];
        for (var r = 0; r < outputSize; r++)
        {
            for (var c = 0; c < inputSize; c++)
            {
                matrix[(r * inputSize) + c] = (float)rows[r][c];
            }
        }

        return new SeededProjection(outputSize, inputSize, matrix);
    }

    public ReadOnlySpan<float> Row(int index) => matrix.AsSpan(index * InputSize, InputSize);

    /// <summary>Writes the projection of <paramref name="state"/>, L2-normalised, into <paramref name="output"/>.</summary>
    public void ProjectNormalised(ReadOnlySpan<float> state, Span<float> output)
    {
        for (var r = 0; r < OutputSize; r++)
        {
            output[r] = TensorPrimitives.Dot(Row(r), state);
        }

        var norm = TensorPrimitives.Norm(output[..OutputSize]);
        if (norm > 0f)
        {
            TensorPrimitives.Divide(output[..OutputSize], norm, output[..OutputSize]);
        }
        else
        {
            // A state orthogonal to every row (never seen in practice): the first axis stands for it, so rows stay unit length.
            output[..OutputSize].Clear();
            output[0] = 1f;
        }
    }
}
