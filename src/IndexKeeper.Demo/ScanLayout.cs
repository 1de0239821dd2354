namespace IndexKeeper.Demo;

/// <summary>What a scanned page shows.</summary>
internal enum ScanLayout
{
    /// <summary>A filled-in field inspection sheet: boxes, handwriting, a stamp.</summary>
    FieldSheet,

    /// <summary>A typed delivery note with a ruled table and a signature.</summary>
    DeliveryNote,

    /// <summary>A handwritten log book page on ruled lines.</summary>
    LogPage,
}
