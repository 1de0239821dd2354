namespace IndexKeeper.Demo;

/// <summary>Simple process schematics and network plans from lines, rectangles and circles: tanks, pumps,
/// valves, meters and instruments joined by pipes, laid out from a seeded draw.</summary>
internal static class SchematicDrawer
{
    private enum Part
    {
        Tank,
        Pump,
        PumpPair,
        Valve,
        Meter,
        Instrument,
    }

    /// <summary>A left-to-right process line for the topic inside the given box.</summary>
    public static void Process(PageWriter page, double left, double bottom, double width, double height, DemoRandom random, DemoTopic topic)
    {
        var parts = PartsFor(topic, random);
        double mainY = bottom + height * 0.45;
        double step = width / parts.Count;
        double unit = Math.Min(step * 0.5, height * 0.22);

        page.StrokeColour(30, 90, 160);
        page.Line(left + step * 0.5, mainY, left + width - step * 0.5, mainY, 2.2);
        page.ResetColour();

        for (int index = 0; index < parts.Count; index++)
        {
            double x = left + step * (index + 0.5);
            var (part, label) = parts[index];
            switch (part)
            {
                case Part.Tank:
                    Tank(page, x - unit * 0.6, mainY - unit * 0.6, unit * 1.2, unit * 1.5, 30 + random.Next(60));
                    break;
                case Part.Pump:
                    Pump(page, x, mainY, unit * 0.55);
                    break;
                case Part.PumpPair:
                    PumpPair(page, x, mainY, unit * 0.45, step * 0.35);
                    break;
                case Part.Valve:
                    Valve(page, x, mainY, unit * 0.3, closed: random.Chance(20));
                    break;
                case Part.Meter:
                    Meter(page, x, mainY, unit * 0.4);
                    break;
                case Part.Instrument:
                    Instrument(page, x, mainY, unit * 0.35, random);
                    break;
            }

            page.TextCentred(label, x, bottom + 6, 7.5);
        }

        Arrow(page, left + width - step * 0.5, mainY);
    }

    /// <summary>A plan of water mains on a street grid: mains, valves at junctions, hydrants, a reservoir.</summary>
    public static void Network(PageWriter page, double left, double bottom, double width, double height, DemoRandom random)
    {
        int columns = random.Next(4, 7);
        int rows = random.Next(3, 5);
        double dx = width / (columns + 1);
        double dy = height / (rows + 1);

        page.StrokeColour(170, 170, 170);
        for (int column = 1; column <= columns; column++)
        {
            page.Line(left + column * dx, bottom + 8, left + column * dx, bottom + height - 8, 7);
        }

        for (int row = 1; row <= rows; row++)
        {
            page.Line(left + 8, bottom + row * dy, left + width - 8, bottom + row * dy, 7);
        }

        page.StrokeColour(30, 90, 160);
        for (int column = 1; column <= columns; column++)
        {
            page.Line(left + column * dx, bottom + dy, left + column * dx, bottom + rows * dy, random.Chance(30) ? 2.5 : 1.2);
        }

        for (int row = 1; row <= rows; row++)
        {
            page.Line(left + dx, bottom + row * dy, left + columns * dx, bottom + row * dy, row == 1 ? 2.5 : 1.2);
        }

        page.ResetColour();
        int valveNumber = 100 + random.Next(800);
        for (int column = 1; column <= columns; column++)
        {
            for (int row = 1; row <= rows; row++)
            {
                double x = left + column * dx;
                double y = bottom + row * dy;
                if (random.Chance(55))
                {
                    Valve(page, x + 10, y, 4, closed: random.Chance(10));
                    page.Text("V" + DemoNumber.Integer(valveNumber++), x + 4, y + 6, 6);
                }

                if (random.Chance(25))
                {
                    page.Circle(x, y - dy * 0.4, 6, 0.75);
                    page.Text("H", x - 2, y - dy * 0.4 - 2.2, 6, page.Fonts.Bold);
                }
            }
        }

        double reservoirX = left + 12;
        double reservoirY = bottom + height - dy * 0.9;
        Tank(page, reservoirX, reservoirY, dx * 0.7, dy * 0.6, 70);
        page.Text("Service reservoir", reservoirX, reservoirY - 9, 7, page.Fonts.Bold);
        page.StrokeColour(30, 90, 160);
        page.Line(reservoirX + dx * 0.35, reservoirY - 12, reservoirX + dx * 0.35, bottom + rows * dy, 2.5);
        page.Line(reservoirX + dx * 0.35, bottom + rows * dy, left + dx, bottom + rows * dy, 2.5);
        page.ResetColour();

        // Street names along the roads, as on a network plan.
        string[] streets = ["Mill Lane", "Station Road", "Chapel Street", "Quarry Road", "Beck Side", "Ings Lane", "High Street", "Low Green"];
        for (int row = 1; row <= rows; row++)
        {
            page.Text(random.Pick(streets), left + dx * (1 + random.Next(columns - 1)) + 14, bottom + row * dy - 12, 6.5, page.Fonts.Italic);
        }
    }

    private static List<(Part Part, string Label)> PartsFor(DemoTopic topic, DemoRandom random)
    {
        var parts = topic switch
        {
            DemoTopic.PumpStation => new List<(Part, string)>
            {
                (Part.Tank, "Wet well"), (Part.Instrument, "Level"), (Part.PumpPair, "Duty / standby"),
                (Part.Valve, "Non-return"), (Part.Meter, "Flow meter"), (Part.Valve, "Outlet isolation"),
            },
            DemoTopic.Chlorination => new List<(Part, string)>
            {
                (Part.Tank, "Bulk tank"), (Part.Valve, "Foot valve"), (Part.Pump, "Dosing pump"),
                (Part.Instrument, "Flow switch"), (Part.Tank, "Contact tank"), (Part.Instrument, "Residual"),
            },
            DemoTopic.Valves => new List<(Part, string)>
            {
                (Part.Valve, "Inlet isolation"), (Part.Instrument, "Inlet pressure"), (Part.Valve, "Reducing valve"),
                (Part.Instrument, "Outlet pressure"), (Part.Meter, "District meter"), (Part.Valve, "Outlet isolation"),
            },
            _ => new List<(Part, string)>
            {
                (Part.Valve, "Inlet valve"), (Part.Meter, "Inlet meter"), (Part.Tank, "Cell 1"),
                (Part.Tank, "Cell 2"), (Part.Instrument, "Turbidity"), (Part.Valve, "Outlet valve"),
            },
        };
        if (random.Chance(50))
        {
            parts.Insert(1 + random.Next(parts.Count - 1), (Part.Valve, "Isolation"));
        }

        return parts;
    }

    private static void Tank(PageWriter page, double x, double y, double width, double height, int fillPercent)
    {
        page.Rectangle(x, y, width, height, 1.2);
        double level = y + height * fillPercent / 100;
        page.StrokeColour(30, 90, 160);
        page.Line(x + 2, level, x + width - 2, level, 0.75);
        for (double hatch = level - 5; hatch > y + 2; hatch -= 5)
        {
            page.Line(x + width * 0.2, hatch, x + width * 0.8, hatch, 0.3);
        }

        page.ResetColour();
    }

    private static void Pump(PageWriter page, double x, double y, double radius)
    {
        page.FillColour(255, 255, 255);
        page.Circle(x, y, radius * 2, 1.2, fill: true);
        page.ResetColour();
        page.Triangle(x - radius * 0.5, y - radius * 0.6, x - radius * 0.5, y + radius * 0.6, x + radius * 0.7, y, 0.75);
    }

    private static void PumpPair(PageWriter page, double x, double y, double radius, double spread)
    {
        page.StrokeColour(30, 90, 160);
        page.Line(x - spread, y, x - spread, y + radius * 2.4, 1.5);
        page.Line(x + spread, y, x + spread, y + radius * 2.4, 1.5);
        page.Line(x - spread, y + radius * 2.4, x + spread, y + radius * 2.4, 1.5);
        page.ResetColour();
        Pump(page, x, y, radius);
        Pump(page, x, y + radius * 2.4, radius);
    }

    private static void Valve(PageWriter page, double x, double y, double size, bool closed)
    {
        page.Triangle(x - size, y - size * 0.7, x - size, y + size * 0.7, x, y, 0.75, fill: closed);
        page.Triangle(x + size, y - size * 0.7, x + size, y + size * 0.7, x, y, 0.75, fill: closed);
        if (!closed)
        {
            page.Line(x, y, x, y + size * 1.3, 0.75);
            page.Line(x - size * 0.5, y + size * 1.3, x + size * 0.5, y + size * 1.3, 0.75);
        }
    }

    private static void Meter(PageWriter page, double x, double y, double radius)
    {
        page.FillColour(255, 255, 255);
        page.Rectangle(x - radius, y - radius * 0.7, radius * 2, radius * 1.4, 1, fill: true);
        page.ResetColour();
        page.TextCentred("FM", x, y - 2.5, 7, page.Fonts.Bold);
    }

    private static void Instrument(PageWriter page, double x, double y, double radius, DemoRandom random)
    {
        double top = y + radius * 2.6;
        page.Line(x, y, x, top - radius, 0.5);
        page.Circle(x, top, radius * 2, 0.75);
        page.TextCentred(random.Pick(["LT", "PT", "FT", "AT"]), x, top + 0.5, 6, page.Fonts.Bold);
        page.TextCentred(DemoNumber.Integer(random.Next(10, 99)), x, top - 6, 5.5);
    }

    private static void Arrow(PageWriter page, double x, double y)
    {
        page.FillColour(30, 90, 160);
        page.Triangle(x, y - 4, x, y + 4, x + 8, y, 0.5, fill: true);
        page.ResetColour();
    }
}
