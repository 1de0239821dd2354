namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>Draws PDF pages to pixels: the I/O adapter in front of an external renderer.</summary>
internal interface IPdfRenderer
{
    /// <summary>Names the renderer and its version; part of the encoder id (another renderer draws other pixels).</summary>
    string Version { get; }

    /// <summary>
    /// Draws pages <paramref name="firstPage"/> to <paramref name="lastPage"/> (1-based, inclusive) of one PDF
    /// as displayed (crop box, rotation applied) at <paramref name="dpi"/>, handing each to
    /// <paramref name="onPage"/> in page order as soon as it is drawn.
    /// </summary>
    /// <exception cref="InvalidOperationException">The document cannot be drawn; the message says why.</exception>
    void Render(string path, int firstPage, int lastPage, int dpi, Action<int, RasterImage> onPage, CancellationToken cancellationToken);
}
