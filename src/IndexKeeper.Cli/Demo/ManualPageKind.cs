namespace IndexKeeper.Cli.Demo;

internal enum ManualPageKind
{
    Cover,
    Contents,
    Text,
    Procedure,
    Table,
    Schematic,
    PhotoPng,
    PhotoJpeg,
    Appendix,
}
