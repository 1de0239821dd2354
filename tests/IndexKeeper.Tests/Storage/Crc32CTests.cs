using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Storage;

public sealed class Crc32CTests
{
    // RFC 3720 (iSCSI), Appendix B.4 "CRC Examples"; the RFC prints the CRC bytes in transmission
    // order (least significant byte first), so "aa 36 91 8a" is the value 0x8A9136AA.
    [Fact]
    public void Matches_rfc3720_b4_examples()
    {
        Assert.Equal(0x8A9136AAu, Crc32C.Compute(new byte[32]));
        Assert.Equal(0x62A8AB43u, Crc32C.Compute(Enumerable.Repeat((byte)0xFF, 32).ToArray()));
        Assert.Equal(0x46DD794Eu, Crc32C.Compute(Enumerable.Range(0, 32).Select(i => (byte)i).ToArray()));
        Assert.Equal(0x113FDB5Cu, Crc32C.Compute(Enumerable.Range(0, 32).Select(i => (byte)(31 - i)).ToArray()));

        // RFC 3720 B.4, "An iSCSI - SCSI Read (10) Command PDU": 48 bytes; the RFC prints its CRC as
        // d9 96 3a 56, which reference implementations check as the value 0xD9963A56.
        var pdu = new byte[48];
        pdu[0] = 0x01;
        pdu[1] = 0xC0;
        pdu[16] = 0x14;
        pdu[22] = 0x04;
        pdu[27] = 0x14;
        pdu[31] = 0x18;
        pdu[32] = 0x28;
        pdu[40] = 0x02;
        Assert.Equal(0xD9963A56u, Crc32C.Compute(pdu));
    }

    [Fact]
    public void Append_equals_one_pass_for_every_split()
    {
        var data = Enumerable.Range(0, 77).Select(i => (byte)(i * 37)).ToArray();
        var whole = Crc32C.Compute(data);
        for (var split = 0; split <= data.Length; split++)
        {
            Assert.Equal(whole, Crc32C.Append(Crc32C.Compute(data.AsSpan(0, split)), data.AsSpan(split)));
        }
    }
}
