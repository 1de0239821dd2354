namespace IndexKeeper.Cli.Demo;

internal enum ScanFormat
{
    Png,
    Jpeg,
    Tiff,
}
