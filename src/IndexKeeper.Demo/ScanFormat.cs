namespace IndexKeeper.Demo;

internal enum ScanFormat
{
    Png,
    Jpeg,
    Tiff,
}
