namespace IndexKeeper.Tests.Encoding.PageImages;

/// <summary>Compares floats within an absolute tolerance.</summary>
internal sealed class Tolerance(float epsilon) : IEqualityComparer<float>
{
    public bool Equals(float x, float y) => Math.Abs(x - y) <= epsilon;

    public int GetHashCode(float obj) => 0;
}
