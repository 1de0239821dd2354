namespace IndexKeeper.Demo;

/// <summary>Invented but plausible vocabulary of a small water utility. Plain ASCII only: the standard 14
/// PDF fonts are written with a single-byte encoding.</summary>
internal static class DemoVocabulary
{
    public static readonly IReadOnlyList<string> Roles =
    [
        "duty operator", "shift supervisor", "maintenance fitter", "process scientist", "control room operator",
        "area manager", "electrical technician", "site technician",
    ];

    public static readonly IReadOnlyList<string> Intervals =
    [
        "week", "fortnight", "month", "quarter", "six months", "year",
    ];

    public static readonly IReadOnlyList<string> Actions =
    [
        "inspect", "clean", "test", "adjust", "lubricate", "calibrate", "record", "tighten",
    ];

    public static readonly IReadOnlyList<string> People =
    [
        "R. Okafor", "M. Lindqvist", "J. Abernethy", "S. Pardeep", "T. Whitcombe", "A. Nwosu", "H. Castellane",
        "D. Firth", "L. Moorcroft", "E. Tanaka-Reid",
    ];

    public static readonly IReadOnlyList<string> Sites =
    [
        "Kestrel Lane", "Brindle Hill", "Ashby Road", "Highfold", "Corran Moss", "Tanners Gate", "Wyke End",
        "Sallow Bank", "Pennock Ridge", "Marlow Fold",
    ];

    public static readonly IReadOnlyList<string> CommonSections =
    [
        "Introduction and scope", "Health and safety", "Description of the installation", "Normal operation",
        "Start-up and shutdown", "Routine maintenance", "Fault finding", "Spares and consumables",
        "Records and reporting",
    ];

    public static TopicWords For(DemoTopic topic) => topic switch
    {
        DemoTopic.PumpStation => PumpStation,
        DemoTopic.Chlorination => Chlorination,
        DemoTopic.Valves => Valves,
        DemoTopic.Reservoir => Reservoir,
        _ => throw new ArgumentOutOfRangeException(nameof(topic), topic, "unknown topic"),
    };

    private static readonly TopicWords PumpStation = new(
        "pump station",
        ["duty pump", "standby pump", "wet well", "surge vessel", "variable speed drive", "delivery main", "level controller", "motor control centre"],
        ["mechanical seal", "non-return valve", "bearing housing", "impeller", "suction strainer", "coupling guard", "pressure transmitter", "level probe"],
        ["excessive vibration", "seal leakage", "overheating", "cavitation noise", "blocked strainer", "worn coupling rubbers", "loose terminals"],
        [
            new("a delivery pressure of # bar", 28, 64, 1),
            new("a motor current of # A", 18, 74, 0),
            new("a wet well level of # m", 80, 310, 2),
            new("a flow of # m3/h", 90, 420, 0),
            new("a bearing temperature of # deg C", 31, 68, 0),
        ],
        ["Pump and motor sets", "Wet well and level control", "Surge protection", "Electrical supply and control panel"],
        ["Changing over the duty pump", "Isolating a pump for maintenance", "Clearing a blocked strainer", "Resetting the drive after a trip", "Draining the surge vessel"],
        [
            ("Pump fails to start", "drive tripped on overcurrent", "reset the drive and check the motor insulation"),
            ("Low delivery pressure", "worn impeller or open bypass", "check the bypass valve, then inspect the impeller"),
            ("High wet well alarm", "level probe fouled", "clean the probe and test the alarm"),
            ("Pump runs but no flow", "air lock in the suction", "vent the casing and check the non-return valve"),
            ("Noisy pump", "cavitation at low suction level", "raise the stop level and check the strainer"),
        ],
        [
            ("Check pump vibration and noise", "week"), ("Inspect mechanical seals for leakage", "week"),
            ("Grease motor bearings", "quarter"), ("Test standby pump run", "fortnight"),
            ("Calibrate level controller", "six months"), ("Thermographic survey of panel", "year"),
        ]);

    private static readonly TopicWords Chlorination = new(
        "chlorination plant",
        ["hypochlorite dosing pump", "bulk storage tank", "contact tank", "chlorine residual analyser", "dosing controller", "carrier water booster", "day tank", "bund"],
        ["injection quill", "foot valve", "pulsation damper", "sample line", "reagent bottle", "pressure relief valve", "flow switch", "calibration cylinder"],
        ["gas locking of the dosing head", "crystallised hypochlorite", "a drifting analyser", "a blocked injection quill", "leaks in the bund", "a faded reagent"],
        [
            new("a free chlorine residual of # mg/l", 35, 95, 2),
            new("a dosing rate of # l/h", 8, 46, 1),
            new("a bulk tank level of # %", 22, 96, 0),
            new("a contact time of # minutes", 28, 64, 0),
            new("a sample flow of # l/min", 4, 18, 1),
        ],
        ["Hypochlorite storage and handling", "Dosing control and analysers", "Contact tank and sampling", "Delivery of bulk chemicals"],
        ["Calibrating the residual analyser", "Priming a dosing pump", "Receiving a bulk delivery", "Changing the reagent bottle", "Flushing the injection quill"],
        [
            ("Low chlorine residual alarm", "dosing pump gas locked", "bleed the dosing head and confirm the stroke"),
            ("Residual reading unstable", "air in the sample line", "bleed the sample line and check the flow"),
            ("Dosing pump not delivering", "crystals in the foot valve", "flush with clean water and replace the valve seat"),
            ("High residual alarm", "controller set point altered", "restore the approved set point and report it"),
            ("Bund level alarm", "leak from a tank fitting", "isolate the tank and call the standby fitter"),
        ],
        [
            ("Verify analyser against a hand test", "week"), ("Inspect dosing lines and bund", "week"),
            ("Replace analyser reagent", "month"), ("Service dosing pump heads", "six months"),
            ("Inspect bulk tank internally", "year"), ("Test emergency shower", "week"),
        ]);

    private static readonly TopicWords Valves = new(
        "valve and network",
        ["gate valve", "butterfly valve", "pressure reducing valve", "air valve", "washout valve", "fire hydrant", "boundary valve", "flow control valve"],
        ["spindle", "gland packing", "actuator gearbox", "pilot circuit", "surface box", "valve chamber cover", "position indicator", "strainer screen"],
        ["a seized spindle", "gland weeping", "a sticking pilot", "a buried surface box", "a cracked chamber cover", "air locking downstream"],
        [
            new("# turns to fully open", 12, 96, 0),
            new("a downstream pressure of # bar", 18, 52, 1),
            new("a closing torque of # Nm", 40, 260, 0),
            new("an inlet pressure of # bar", 42, 88, 1),
            new("a chamber depth of # m", 80, 240, 2),
        ],
        ["Valve types and identification", "Valve exercising programme", "Pressure management", "Network records"],
        ["Exercising a buried valve", "Setting a pressure reducing valve", "Replacing gland packing", "Venting an air valve", "Operating a boundary valve"],
        [
            ("Valve will not turn", "seized spindle", "apply steady torque only; report for excavation if it does not free"),
            ("Pressure overshoot downstream", "pilot valve sticking", "clean the pilot and check the set point"),
            ("Water at the surface box", "gland leakage", "tighten the gland evenly or repack it"),
            ("Low pressure complaints", "boundary valve left shut", "check the valve register and open as recorded"),
            ("Air in customer supplies", "air valve blocked", "clean the float chamber and test the valve"),
        ],
        [
            ("Exercise critical valves", "six months"), ("Check pressure reducing valve settings", "month"),
            ("Inspect air valves", "quarter"), ("Clean pilot strainers", "quarter"),
            ("Survey surface boxes", "year"), ("Update valve register", "month"),
        ]);

    private static readonly TopicWords Reservoir = new(
        "service reservoir",
        ["inlet main", "outlet main", "overflow weir", "washout", "roof hatch", "level transmitter", "access ladder", "cell division wall"],
        ["roof membrane", "hatch seal", "vent mesh", "floor joint", "ball valve", "sampling tap", "bird screen", "drain pipe"],
        ["sediment on the floor", "a damaged vent mesh", "roof membrane cracking", "hatch seal wear", "corroded ladder fixings", "staining at a joint"],
        [
            new("a top water level of # m AOD", 11240, 11980, 2),
            new("a turbidity of # NTU", 5, 60, 2),
            new("an inflow of # l/s", 12, 95, 0),
            new("a retention time of # hours", 18, 72, 0),
            new("a sediment depth of # mm", 1, 22, 0),
        ],
        ["Access and confined space entry", "Inspection and cleaning", "Water quality sampling", "Structure and roof"],
        ["Taking a cell out of service", "Inspecting the roof and hatches", "Cleaning the floor of a cell", "Returning a cell to supply", "Taking a sample at the outlet"],
        [
            ("Turbidity rise at outlet", "sediment disturbed by high draw-off", "reduce the draw-off and sample again"),
            ("Overflow operating", "inlet ball valve not closing", "check the ball valve and the level signal"),
            ("Level signal frozen", "transmitter fault", "compare with the sight gauge and replace the transmitter"),
            ("Coliforms detected", "ingress through a hatch", "inspect hatches and vents; follow the sampling plan"),
            ("Water on the roof", "membrane failure", "mark the area and arrange a roof survey"),
        ],
        [
            ("Inspect hatches and vents", "week"), ("Check security fencing", "week"),
            ("Sample outlet water", "week"), ("Internal inspection of each cell", "five years"),
            ("Roof survey", "year"), ("Test overflow alarm", "quarter"),
        ]);
}
