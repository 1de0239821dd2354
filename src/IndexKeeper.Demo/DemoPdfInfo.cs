namespace IndexKeeper.Demo;

/// <summary>Document information dictionary of a demo PDF (ISO 32000-1 §14.3.3). Dates are fixed strings
/// in the PDF date format (§7.9.4), never read from the clock.</summary>
internal sealed record DemoPdfInfo(string Title, string Author, string Subject, string CreationDate, string ModifiedDate);
