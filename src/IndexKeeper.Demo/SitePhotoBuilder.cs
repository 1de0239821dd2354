namespace IndexKeeper.Demo;

/// <summary>A painted stand-in for a site photograph: sky, hills, ground, a plant building, a tank, pipework
/// and a fence, each placed and coloured from a seeded draw.</summary>
internal static class SitePhotoBuilder
{
    public const int Width = 360;
    public const int Height = 240;

    public static PixelCanvas Paint(DemoRandom random)
    {
        var canvas = new PixelCanvas(Width, Height, colour: true);
        int horizon = Height * random.Next(48, 62) / 100;
        canvas.VerticalGradient(0, horizon, new DemoColour(96, 146, 206), new DemoColour(214, 228, 240));

        for (int hill = 0; hill < 3; hill++)
        {
            var green = new DemoColour(92, 122, 98).Shade(random.Next(-18, 18));
            canvas.FillEllipse(random.Next(Width), horizon + 10, random.Next(90, 200), random.Next(28, 60), green);
        }

        canvas.VerticalGradient(horizon, Height, new DemoColour(118, 150, 84), new DemoColour(72, 104, 52));

        // Plant building with a darker roof band, windows and a door.
        int buildingX = random.Next(20, 180);
        int buildingWidth = random.Next(120, 190);
        int buildingHeight = random.Next(70, 110);
        int buildingTop = horizon + 30 - buildingHeight;
        var wall = new DemoColour(164, 98, 72).Shade(random.Next(-20, 20));
        canvas.FillRectangle(buildingX, buildingTop, buildingWidth, buildingHeight, wall);
        canvas.FillRectangle(buildingX - 6, buildingTop - 10, buildingWidth + 12, 12, new DemoColour(64, 64, 70));
        for (int window = buildingX + 14; window + 22 < buildingX + buildingWidth - 30; window += 34)
        {
            canvas.FillRectangle(window, buildingTop + 18, 22, 18, new DemoColour(168, 196, 214));
        }

        canvas.FillRectangle(buildingX + buildingWidth - 34, buildingTop + buildingHeight - 48, 22, 48, new DemoColour(52, 78, 110));

        // Tank: a cylinder seen from the side.
        int tankX = Math.Min(Width - 70, buildingX + buildingWidth + random.Next(30, 90));
        int tankWidth = random.Next(50, 80);
        int tankHeight = random.Next(60, 100);
        int tankBottom = horizon + 34;
        var steel = new DemoColour(176, 184, 190).Shade(random.Next(-15, 15));
        canvas.FillRectangle(tankX, tankBottom - tankHeight, tankWidth, tankHeight, steel);
        canvas.FillEllipse(tankX + tankWidth / 2, tankBottom - tankHeight, tankWidth / 2, 8, steel.Shade(22));
        canvas.FillEllipse(tankX + tankWidth / 2, tankBottom, tankWidth / 2, 8, steel);

        // Pipe from the building to the tank, with a valve body.
        int pipeY = tankBottom - 14;
        canvas.FillRectangle(buildingX + buildingWidth, pipeY, tankX - buildingX - buildingWidth, 7, new DemoColour(40, 90, 150));
        canvas.FillRectangle((buildingX + buildingWidth + tankX) / 2 - 5, pipeY - 6, 10, 19, new DemoColour(200, 40, 40));

        // Fence posts and wire along the front.
        int fenceY = Height - random.Next(40, 70);
        canvas.FillRectangle(0, fenceY, Width, 2, new DemoColour(70, 70, 70));
        canvas.FillRectangle(0, fenceY + 14, Width, 2, new DemoColour(70, 70, 70));
        for (int post = random.Next(20); post < Width; post += 38)
        {
            canvas.FillRectangle(post, fenceY - 8, 4, 40, new DemoColour(90, 80, 66));
        }

        return canvas;
    }
}
