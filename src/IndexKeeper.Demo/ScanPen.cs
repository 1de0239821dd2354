namespace IndexKeeper.Demo;

/// <summary>Draws ink on a canvas, applying the page's skew.</summary>
internal sealed class ScanPen(PixelCanvas canvas, int skewPerMille)
{
    private const int Ink = 52;

    public void Dot(int x, int y, int size, int level) =>
        canvas.FillRectangle(x, y + x * skewPerMille / 1000, size, size, DemoColour.OfGrey(level));

    public void Block(int x, int y, int width, int height, int level)
    {
        for (int column = x; column < x + width; column++)
        {
            canvas.FillRectangle(column, y + column * skewPerMille / 1000, 1, height, DemoColour.OfGrey(level));
        }
    }

    public void Rectangle(int x, int y, int width, int height, int thickness)
    {
        Block(x, y, width, thickness, Ink);
        Block(x, y + height - thickness, width, thickness, Ink);
        Block(x, y, thickness, height, Ink);
        Block(x + width - thickness, y, thickness, height, Ink);
    }

    /// <summary>Printed-looking words: letter blocks of x-height with ascenders and descenders.</summary>
    public void TextLine(DemoRandom random, int x, int baseline, int length, int xHeight)
    {
        int end = x + length;
        while (x < end)
        {
            int letters = random.Next(2, 9);
            for (int letter = 0; letter < letters && x < end; letter++)
            {
                int width = xHeight * random.Next(55, 85) / 100;
                int top = baseline - xHeight;
                int height = xHeight;
                int shape = random.Next(10);
                if (shape < 3)
                {
                    top -= xHeight / 2;
                    height += xHeight / 2;
                }
                else if (shape == 3)
                {
                    height += xHeight / 3;
                }

                Block(x, top, width, height, Ink + random.Next(0, 30));
                x += width + Math.Max(1, xHeight / 5);
            }

            x += xHeight;
        }
    }

    /// <summary>Cursive-looking words: connected strokes that swing up and down while drifting right.</summary>
    public void Handwriting(DemoRandom random, int x, int y, int length)
    {
        int end = x + length;
        int level = 40 + random.Next(0, 25);
        while (x < end)
        {
            int previousX = x;
            int previousY = y;
            for (int stroke = random.Next(4, 14); stroke > 0 && x < end; stroke--)
            {
                int nextX = x + random.Next(2, 6);
                int nextY = y + random.Next(-9, 5);
                Stroke(previousX, previousY, nextX, nextY, level);
                previousX = nextX;
                previousY = nextY;
                x = nextX;
            }

            Stroke(previousX, previousY, x + 2, y, level);
            x += random.Next(8, 16);
        }
    }

    /// <summary>A 2-pixel pen line from one point to another, stepped along its longer axis.</summary>
    private void Stroke(int fromX, int fromY, int toX, int toY, int level)
    {
        int steps = Math.Max(1, Math.Max(Math.Abs(toX - fromX), Math.Abs(toY - fromY)));
        for (int step = 0; step <= steps; step++)
        {
            Dot(fromX + (toX - fromX) * step / steps, fromY + (toY - fromY) * step / steps, 2, level);
        }
    }

    public void Ring(int centreX, int centreY, int radius, int thickness)
    {
        int outer = radius * radius;
        int inner = (radius - thickness) * (radius - thickness);
        for (int dy = -radius; dy <= radius; dy++)
        {
            for (int dx = -radius; dx <= radius; dx++)
            {
                int distance = dx * dx + dy * dy;
                if (distance <= outer && distance >= inner)
                {
                    Dot(centreX + dx, centreY + dy, 1, 96);
                }
            }
        }
    }
}
