using IndexKeeper.Core.Documents;
using IndexKeeper.Tests.Documents;
using MimeKit;

namespace IndexKeeper.Tests.Readers;

/// <summary>E-mail messages built with MimeKit (RFC 5322 and MIME, RFC 2045–2049).</summary>
public sealed class EmailReaderTests : IDisposable
{
    private readonly TempFolder folder = new();

    [Fact]
    public void The_message_comes_first_and_its_attachments_follow_as_pages()
    {
        var message = Message("Dredging notice", "The eastern quay closes from 3 May.");
        var body = new Multipart("mixed")
        {
            new TextPart("plain") { Text = "The eastern quay closes from 3 May." },
            Attachment("rota.txt", "Pilot rota\nMonday: Okafor\nTuesday: Pennock"u8.ToArray()),
            Attachment("plan.pdf", SampleDocuments.Builder(1, _ => "Dredging plan, berth 4")),
            Attachment("archive.bin", [0, 1, 2, 3]),
        };
        message.Body = body;

        var content = Read(message);

        Assert.Equal(DocumentKind.Email, content.Kind);
        Assert.Equal([1, 2, 3], content.Pages.Select(p => p.Number));
        Assert.Contains(content.Pages[0].Words, w => w.Text == "rota.txt,");
        Assert.Contains(content.Pages[1].Words, w => w.Text == "Okafor");
        Assert.Contains(content.Pages[2].Words, w => w.Text == "Dredging");
    }

    [Fact]
    public void One_hundred_attachments_are_too_many_parts()
    {
        var message = Message("Rota", "See attached.");
        var body = new Multipart("mixed") { new TextPart("plain") { Text = "See attached." } };
        for (var i = 0; i < 100; i++)
        {
            body.Add(Attachment($"rota-{i}.txt", "Pilot rota"u8.ToArray()));
        }

        message.Body = body;
        var failure = Assert.Throws<DocumentReadException>(() => Read(message));
        Assert.Equal(QuarantineReason.TooManyParts, failure.Reason);
    }

    [Fact]
    public void One_hundred_nested_messages_are_too_deep()
    {
        var message = Message("Level 0", "innermost");
        for (var depth = 1; depth <= 100; depth++)
        {
            var outer = Message("Level " + depth, "forwarded");
            outer.Body = new Multipart("mixed")
            {
                new TextPart("plain") { Text = "forwarded" },
                new MessagePart { Message = message, ContentDisposition = new ContentDisposition(ContentDisposition.Attachment) },
            };
            message = outer;
        }

        var failure = Assert.Throws<DocumentReadException>(() => Read(message));
        Assert.Equal(QuarantineReason.TooManyParts, failure.Reason);
    }

    public void Dispose() => folder.Dispose();

    private DocumentContent Read(MimeMessage message)
    {
        using var stream = new MemoryStream();
        message.WriteTo(stream);
        return DocumentReaderFactory.Create().Read(folder.Write($"message-{Guid.NewGuid():N}.eml", stream.ToArray()), ReadLimits.Default, CancellationToken.None);
    }

    private static MimeMessage Message(string subject, string text)
    {
        var message = new MimeMessage { Subject = subject, Date = new DateTimeOffset(2025, 4, 2, 8, 30, 0, TimeSpan.Zero) };
        message.From.Add(new MailboxAddress("Harbour office", "office@kellmarsh-harbour.example"));
        message.To.Add(new MailboxAddress("Pilots", "pilots@kellmarsh-harbour.example"));
        message.Body = new TextPart("plain") { Text = text };
        return message;
    }

    private static MimePart Attachment(string name, byte[] data) => new("application", "octet-stream")
    {
        Content = new MimeContent(new MemoryStream(data)),
        ContentDisposition = new ContentDisposition(ContentDisposition.Attachment),
        ContentTransferEncoding = ContentEncoding.Base64,
        FileName = name,
    };
}
