namespace IndexKeeper.Demo;

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
