using MimeKit;

namespace IndexKeeper.Core.Documents.Text;

/// <summary>
/// Reads an e-mail message (RFC 5322 with MIME, parsed by MimeKit): its header lines and text body become
/// text pages, and each attachment the reader understands follows as further pages of the same document,
/// read by <paramref name="readAttachment"/> (attached messages likewise, recursively). Nesting and the
/// number of attachments are bounded by <see cref="ReaderSettings"/> (docs/readers.md, "E-mail").
/// </summary>
internal sealed class EmailReader(ReaderSettings settings, Func<byte[], string, int, ReadLimits, CancellationToken, DocumentContent?> readAttachment)
{
    public DocumentContent Read(byte[] file, int depth, ReadLimits limits, CancellationToken cancellationToken)
    {
        var parts = 0;
        var pages = ReadMessage(file, depth, ref parts, limits, cancellationToken, out var subject);
        return new DocumentContent(DocumentKind.Email, pages) { Title = DocumentTitle.Clean(subject) };
    }

    private List<PageContent> ReadMessage(byte[] file, int depth, ref int parts, ReadLimits limits, CancellationToken cancellationToken, out string? subject)
    {
        if (depth > settings.MaxNestingDepth)
        {
            throw new DocumentReadException(QuarantineReason.TooManyParts, $"messages are attached to messages more than {settings.MaxNestingDepth} deep");
        }

        MimeMessage message;
        try
        {
            message = MimeMessage.Load(new MemoryStream(file, writable: false), cancellationToken);
        }
        catch (FormatException e)
        {
            throw new DocumentReadException(QuarantineReason.Corrupt, $"the e-mail cannot be parsed: {e.Message}", e);
        }

        subject = message.Subject;

        var attachments = message.Attachments.ToList();
        var lines = new List<string>
        {
            "From: " + message.From,
            "To: " + message.To,
        };
        if (message.Cc.Count > 0)
        {
            lines.Add("Cc: " + message.Cc);
        }

        lines.Add("Date: " + message.Date.ToString("yyyy-MM-dd HH:mm zzz", System.Globalization.CultureInfo.InvariantCulture));
        lines.Add("Subject: " + message.Subject);
        if (attachments.Count > 0)
        {
            lines.Add("Attachments: " + string.Join(", ", attachments.Select(Name)));
        }

        lines.Add(string.Empty);
        lines.AddRange(message.TextBody is { } plain ? TextDecoding.Lines(plain)
            : message.HtmlBody is { } html ? HtmlText.Lines(html) : []);
        var pages = TextPageLayout.Paginate(lines, limits.MaxPages, cancellationToken).ToList();

        foreach (var attachment in attachments)
        {
            cancellationToken.ThrowIfCancellationRequested();
            parts++;
            if (parts > settings.MaxParts)
            {
                throw new DocumentReadException(QuarantineReason.TooManyParts, $"the e-mail carries more than {settings.MaxParts} attachments (all levels together)");
            }

            var bytes = Content(attachment, limits);
            var attached = attachment is MessagePart
                ? ReadMessage(bytes, depth + 1, ref parts, limits, cancellationToken, out _)
                : readAttachment(bytes, Name(attachment), depth + 1, limits, cancellationToken)?.Pages.ToList() ?? [];
            pages.AddRange(attached);
            if (pages.Count > limits.MaxPages)
            {
                throw new DocumentReadException(QuarantineReason.TooManyPages, $"the e-mail and its attachments have more than the limit of {limits.MaxPages} pages");
            }
        }

        return pages.Select((p, i) => p with { Number = i + 1 }).ToList();
    }

    private static string Name(MimeEntity entity) => entity switch
    {
        MimePart part => part.FileName ?? "(unnamed " + part.ContentType.MimeType + ")",
        MessagePart message => (message.Message?.Subject ?? "message") + ".eml",
        _ => entity.ContentType.MimeType,
    };

    private static byte[] Content(MimeEntity entity, ReadLimits limits)
    {
        using var buffer = new CappedStream(limits.MaxDecodedBytesPerStream);
        try
        {
            switch (entity)
            {
                case MimePart part when part.Content is not null:
                    part.Content.DecodeTo(buffer);
                    break;
                case MessagePart message when message.Message is not null:
                    message.Message.WriteTo(buffer);
                    break;
            }
        }
        catch (CappedStream.FullException)
        {
            throw new DocumentReadException(QuarantineReason.DecodedStreamTooLarge, $"an attachment decodes to more than {limits.MaxDecodedBytesPerStream} bytes");
        }

        return buffer.ToArray();
    }
}
