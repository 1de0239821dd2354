namespace IndexKeeper.Churn.Store;

/// <summary>How a PDF was last saved: as the builder writes it, or rewritten by qpdf (same pages, new bytes).</summary>
internal enum PdfLayout
{
    AsBuilt,
    ObjectStreams,
    Linearized,
}
