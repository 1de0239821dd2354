namespace IndexKeeper.Tests.Monitoring;

/// <summary>One request an <see cref="OtlpReceiver"/> took.</summary>
internal sealed record OtlpRequest(string Path, string ContentType, IReadOnlyDictionary<string, string> Headers, byte[] Body)
{
    /// <summary>True when the protobuf body holds <paramref name="text"/> as a string field (protobuf strings are UTF-8 bytes as they are).</summary>
    public bool Carries(string text) => Body.AsSpan().IndexOf(System.Text.Encoding.UTF8.GetBytes(text)) >= 0;
}
