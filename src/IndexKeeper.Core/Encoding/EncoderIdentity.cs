namespace IndexKeeper.Core.Encoding;

/// <summary>
/// Who made a vector set. <see cref="Id"/> is a fingerprint (hex SHA-256) of everything that changes the
/// vectors; two encoders with different ids are never ranked together.
/// </summary>
/// <param name="Name">The configured name, e.g. <c>hashed-terms</c>.</param>
/// <param name="Description">Human-readable summary of the inputs of the fingerprint.</param>
public sealed record EncoderIdentity(string Id, string Name, string Description, int Dimensions);
