using System.Text;

namespace IndexKeeper.Demo;

/// <summary>
/// Our own small phrase generator: fills sentence templates with the words of one topic, so manuals,
/// forms and reports read like plausible technical text without copying any real document.
/// </summary>
internal sealed class DemoText
{
    // Slots: {E} equipment, {P} part, {C} condition, {V} reading, {R} role, {I} interval, {A} action, {S} site.
    private static readonly string[] SentenceTemplates =
    [
        "Check the {P} of the {E} for {C} and record the result on the inspection sheet.",
        "The {E} normally runs in automatic mode; manual operation needs the agreement of the {R}.",
        "Every {I} the {R} shall {A} the {P} and note any deviation in the site log.",
        "Where the {E} shows {V} or worse, inform the {R} before any further work is done.",
        "Isolate and lock off the {E} before removing any guard or opening the {P}.",
        "At {S} the {E} was last overhauled during the planned outage, and its settings are listed in the schedule.",
        "A typical reading is {V}; a value that drifts over several weeks usually points to {C}.",
        "Do not {A} the {P} while the {E} is in service unless the permit to work allows it.",
        "Spare parts for the {P} are held in the store at {S}; reorder when fewer than two remain.",
        "The {R} confirms that the {E} has returned to normal duty after maintenance.",
        "Signs of {C} at the {P} must be reported the same day, with a photograph where possible.",
        "The alarm on the {E} is passed to the control room, where the {R} decides on the response.",
        "After any repair to the {P}, run the {E} for at least one hour and record {V}.",
        "The design allows the {E} to be maintained while supply continues from the other stream.",
        "Keep the area around the {E} clear; stored materials hide {C} and block access in an emergency.",
        "Readings are logged by telemetry every fifteen minutes, and the {R} reviews the trend each {I}.",
    ];

    private readonly DemoRandom random;
    private readonly TopicWords words;
    private readonly string site;

    public DemoText(DemoRandom random, DemoTopic topic, string site)
    {
        this.random = random;
        words = DemoVocabulary.For(topic);
        Topic = topic;
        this.site = site;
    }

    public TopicWords Words => words;

    public DemoTopic Topic { get; }

    public string Site => site;

    public string Sentence() => Fill(random.Pick(SentenceTemplates));

    public string Paragraph(int sentences)
    {
        var text = new StringBuilder();
        for (int i = 0; i < sentences; i++)
        {
            if (i > 0)
            {
                text.Append(' ');
            }

            text.Append(Sentence());
        }

        return text.ToString();
    }

    public string Reading() => random.Pick(words.Readings).Draw(random);

    public string Equipment() => random.Pick(words.Equipment);

    public string Part() => random.Pick(words.Parts);

    public string Role() => random.Pick(DemoVocabulary.Roles);

    public string Person() => random.Pick(DemoVocabulary.People);

    /// <summary>Numbered steps of a procedure, each an imperative sentence.</summary>
    public IReadOnlyList<string> ProcedureSteps(int count)
    {
        string[] openings =
        [
            "Confirm with the {R} that the {E} may be taken out of service.",
            "Obtain a permit to work and isolate the {E} at the local panel.",
        ];
        string[] middles =
        [
            "Close the isolating valves on either side of the {P}.",
            "Vent the trapped pressure and confirm it reads zero.",
            "{A} the {P} and look for {C}.",
            "Record {V} before and after the work.",
            "Replace any worn {P} with an approved spare from the store.",
            "Refit the guard and remove the locks in the reverse order.",
            "Open the isolating valves slowly and check for leaks.",
        ];
        var steps = new List<string> { Fill(random.Pick(openings)) };
        while (steps.Count < count - 1)
        {
            steps.Add(Fill(random.Pick(middles)));
        }

        steps.Add(Fill("Return the {E} to automatic and tell the control room the work is complete."));
        return steps;
    }

    /// <summary>A visible amendment used by the scripted day-two edit.</summary>
    public string Amendment() => Fill(
        "Amendment: the {R} now checks the {P} of the {E} every week instead of every month, after {C} was found at {S}.");

    private string Fill(string template)
    {
        var text = new StringBuilder(template);
        Replace(text, "{E}", () => random.Pick(words.Equipment));
        Replace(text, "{P}", () => random.Pick(words.Parts));
        Replace(text, "{C}", () => random.Pick(words.Conditions));
        Replace(text, "{V}", () => random.Pick(words.Readings).Draw(random));
        Replace(text, "{R}", () => random.Pick(DemoVocabulary.Roles));
        Replace(text, "{I}", () => random.Pick(DemoVocabulary.Intervals));
        Replace(text, "{A}", () => random.Pick(DemoVocabulary.Actions));
        Replace(text, "{S}", () => site);
        string result = text.ToString();
        return char.ToUpperInvariant(result[0]) + result[1..];
    }

    private static void Replace(StringBuilder text, string slot, Func<string> value)
    {
        for (int at = IndexOf(text, slot); at >= 0; at = IndexOf(text, slot))
        {
            text.Remove(at, slot.Length).Insert(at, value());
        }
    }

    private static int IndexOf(StringBuilder text, string slot) =>
        text.ToString().IndexOf(slot, StringComparison.Ordinal);
}
