using System.Buffers.Binary;
using System.Security.Cryptography;
using System.Text;

namespace IndexKeeper.Churn.Store;

/// <summary>
/// The simulator's own name for what a page shows: a hash of the generator inputs that draw the page.
/// Two pages with the same inputs are drawn alike; different inputs draw different words. It is the
/// truth the index is checked against, computed without looking at any file.
/// </summary>
internal static class ContentId
{
    public static ulong Of(params string[] parts) =>
        BinaryPrimitives.ReadUInt64LittleEndian(SHA256.HashData(Encoding.UTF8.GetBytes(string.Join('\u001f', parts))));
}
