//! Help texts of the interactive session: `help` gives the overview, `help TOPIC` one
//! statement or subject, with examples that are statements of the acceptance set.

use crate::query::MassUnit;
use crate::science::units::{CompositionUnit, PressureUnit, TemperatureUnit};

/// One help topic.
#[derive(Debug, PartialEq, Eq)]
pub struct Topic {
    /// The name shown in the topic list and used after `help`.
    pub name: &'static str,
    /// Other words that find this topic.
    pub aliases: &'static [&'static str],
    /// One line for the overview.
    pub summary: &'static str,
    /// The form of the statement, or what the topic is about.
    pub body: &'static str,
    /// Statements to try.
    pub examples: &'static [&'static str],
}

/// Every topic, statements first, in the order the overview lists them.
pub const TOPICS: &[Topic] = &[
    Topic {
        name: "solubility",
        aliases: &["lookup"],
        summary: "how much of a solute dissolves at a temperature, or a table over a range",
        body: "solubility of SOLUTE at TEMPERATURE [in UNIT]\n\
               solubility of SOLUTE RANGE [every STEP] [in UNIT]\n\
               The saturated loading of a solute in water. SOLUTE is a formula, a name or a \
               synonym. The answer is in g/100g water (anhydrous basis) unless a unit is \
               asked for. Over a range the answer is a table: a row at each end and at every \
               STEP between (5 C, 9 F = 5 K), or a round step giving about ten rows; at most \
               1001 rows.",
        examples: &[
            "solubility of KNO3 at 20 C",
            "solubility of potassium nitrate at 68 F in mol/kg",
            "solubility of Na2SO4 from 0 C to 50 C every 5 C",
        ],
    },
    Topic {
        name: "which",
        aliases: &["screening", "screen", "stay", "salts", "solutes"],
        summary: "which solutes stay dissolved at a loading over a range",
        body: "which salts|solutes stay dissolved at LOADING RANGE [margin PERCENT]\n\
               Screens every solute of the reference at one loading over a temperature \
               range. Each row says whether the loading stays dissolved, the headroom to \
               saturation in percent, and the limiting temperature. With a margin, a solute \
               passes only when its headroom is at least the margin.",
        examples: &[
            "which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%",
            "which solutes stay dissolved at 1.5 mol/kg at 5 C",
        ],
    },
    Topic {
        name: "saturation",
        aliases: &["crystals"],
        summary: "the temperature below which a loading crystallises",
        body: "saturation of SOLUTE at LOADING\n\
               The saturation temperature of a loading: below it crystals can appear. There \
               is one row per crossing of the solubility curve, in C.",
        examples: &["saturation of KNO3 at 40 g/100g water"],
    },
    Topic {
        name: "ceiling",
        aliases: &["maximum", "largest"],
        summary: "the largest loading that is safe over a range",
        body: "ceiling of SOLUTE RANGE [margin PERCENT] [in UNIT]\n\
               The largest loading that stays dissolved over the whole range, less the \
               margin.",
        examples: &["ceiling of KCl from 2 C to 8 C margin 10% in mol/kg"],
    },
    Topic {
        name: "heat",
        aliases: &["heat of solution", "enthalpy"],
        summary: "the heat of solution at a temperature",
        body: "heat of solution of SOLUTE [at TEMPERATURE]\n\
               The heat of solution in kJ/mol (at 25 C, the tables' standard \
               temperature, when none is given). Positive: the solute dissolves \
               endothermically and its solubility rises with temperature.",
        examples: &[
            "heat of solution of KNO3 at 25 C",
            "heat of solution of NH4NO3",
        ],
    },
    Topic {
        name: "dissolving",
        aliases: &[
            "dissolving temperature",
            "warming",
            "exothermic",
            "endothermic",
        ],
        summary: "how warm or cold a batch gets while its solid dissolves",
        body: "dissolving MASS SOLUTE in MASS|VOLUME water from TEMPERATURE [extrapolate]\n\
               The temperature a batch reaches when the solid dissolves with no heat \
               exchanged (adiabatic), from the tables' standard heat of solution and the \
               solution's heat capacity; whether it all dissolves at that temperature; and \
               the cautions of a batch that heats sharply or chills. Masses in mg, g, kg \
               or lb; the water also by volume in L or mL (pure water's mass at the start).",
        examples: &[
            "dissolving 300 g CaCl2 in 1 kg water from 20 C",
            "dissolving 300 g NH4NO3 in 1 kg water from 20 C",
        ],
    },
    Topic {
        name: "dissolved",
        aliases: &["gas", "gases", "henry"],
        summary: "dissolved gas at a temperature and pressure",
        body: "dissolved GAS at TEMPERATURE under PRESSURE|air [in UNIT] [in RECIPE]\n\
               Gas dissolved in water in equilibrium with the gas at a partial pressure, or \
               with air. The answer is in mg/L unless a unit is asked for. With a recipe \
               (`in recipe ...` or a name bound to one) its ions salt the gas out \
               (Sechenov's relation).",
        examples: &[
            "dissolved O2 at 25 C under air",
            "dissolved CO2 at 4 C under 2.5 bar in g/L",
            "dissolved O2 at 25 C in recipe 0.9 %w/v NaCl",
        ],
    },
    Topic {
        name: "freezing",
        aliases: &["ice", "eutectic", "chill"],
        summary: "whether ice or salt comes first when a brine is chilled",
        body: "freezing of SOLUTE at LOADING [at TEMPERATURE]\n\
               freezing of RECIPE [at TEMPERATURE]\n\
               Without a temperature: where the solution starts to freeze. Below 0 C: \
               whether the solution freezes (ice), crystallises (salt) or stays liquid at \
               the temperature; for a recipe, the ice, the salts and the liquid left.",
        examples: &[
            "freezing of NaCl at 10 g/100g water at -10 C",
            "freezing of recipe 23 %w/w NaCl",
        ],
    },
    Topic {
        name: "convert",
        aliases: &["conversion"],
        summary: "a loading in another unit",
        body: "convert LOADING of SOLUTE to UNIT\n\
               Converts a loading of a solute between composition units (the molar mass \
               comes from the formula; per-litre units need a density).",
        examples: &["convert 20 g/100g water of KCl to mol/kg"],
    },
    Topic {
        name: "describe",
        aliases: &["solute"],
        summary: "what the reference holds about a solute",
        body: "describe SOLUTE\n\
               Formula, names, molar mass, the solid phases and the range of the data.",
        examples: &["describe NaCl"],
    },
    Topic {
        name: "sources",
        aliases: &["citations", "cite"],
        summary: "the sources behind a solute's data",
        body: "sources of SOLUTE\n\
               Every source of the solute's data, with provenance and review state.",
        examples: &["sources of NaCl"],
    },
    Topic {
        name: "list",
        aliases: &["find"],
        summary: "solutes with a property",
        body: "list salts|solutes|gases [with anion|cation NAME]\n\
               Lists the solutes of the reference, optionally by ion.",
        examples: &["list salts with anion sulfate"],
    },
    Topic {
        name: "let",
        aliases: &["names", "range", "ranges", "temperature"],
        summary: "give a temperature range a name",
        body: "let NAME = RANGE\n\
               A temperature range is `at T`, `from T1 to T2`, or a name bound with let. \
               Names last for the session (in a batch run, for the rest of the run); \
               `forget` unbinds them.",
        examples: &["let cold = from 2 C to 8 C"],
    },
    Topic {
        name: "require",
        aliases: &["check", "assert"],
        summary: "a check for build tools: fails the run when it does not hold",
        body: "require SOLUTE stays dissolved at LOADING over RANGE [margin PERCENT]\n\
               Holds when the loading stays dissolved over the whole range with at least \
               the margin of headroom. In a batch run, one that does not hold makes the \
               exit code 1 and is named on the error stream with its limiting temperature \
               and shortfall.",
        examples: &[
            "let cold = from 2 C to 8 C",
            "require KCl stays dissolved at 20 g/100g water over cold margin 10%",
        ],
    },
    Topic {
        name: "plot",
        aliases: &["picture", "curve", "graph", "save"],
        summary: "a picture of solubility curves, sketched here or saved as SVG or PNG",
        body: "plot SOLUTE[, SOLUTE ...] [from T1 to T2] [in UNIT] \
               [with loading LOADING [RANGE]] [margin PERCENT] [with ice] [under PRESSURE] \
               [extrapolate]\n\
               Draws each solute's curve over the range (the data's range when none is \
               given): one line per solid phase, tabulated points marked by source, \
               transitions marked, extrapolated parts dashed (drawn beyond the data only \
               with `extrapolate`). `with loading` adds the loading line over its storage \
               range and marks the limiting point; `with ice` draws the whole phase \
               diagram (ice line down to the eutectic). Gases are drawn at a pressure with \
               `under`. Here a text sketch is shown; `save FILE.svg` or `save FILE.png` \
               writes the last plot as a picture (on the command line: --out FILE).",
        examples: &[
            "plot KNO3, KCl from 0 C to 100 C",
            "plot KCl from 0 C to 40 C with loading 30 g/100g water from 2 C to 8 C",
            "plot O2, N2 from 0 C to 40 C under air",
        ],
    },
    Topic {
        name: "recipe",
        aliases: &["recipes", "mixture", "mixtures", "formulation"],
        summary: "several solutes together: the questions a formulation asks",
        body: "let NAME = recipe AMOUNT SOLUTE, AMOUNT SOLUTE, ...\n\
               A recipe is solutes with their amounts in any unit of the units topic \
               (%w/v, mM, g/L, %w/w, g/100g water, mol/kg), bound to a name or written in \
               place (`recipe 0.9 %w/v NaCl, 5 %w/v sucrose`). Ask of it: `require NAME \
               stays dissolved over RANGE [margin P]`, `which solids form in NAME over \
               RANGE`, `saturation of NAME`, `freezing of NAME [at T]`, `describe NAME`, \
               `ph of NAME` (see ph) and `dissolved GAS at T in NAME`. Salts that one \
               Pitzer parameter system holds are checked together; otherwise each solute \
               against its own solubility, a salt sharing an ion with another also by a \
               common-ion estimate (every answer names the model it used); a liquid that \
               mixes with water has no limit, only its ice line. Below 0 C a mixture no \
               parameter system holds freezes by the Zdanovskii-Stokes-Robinson rule, \
               from each solute's own freezing points. Per-litre amounts need the \
               solution's density, from the reference or `assuming density 1.000 kg/L`.",
        examples: &[
            "let rinse = recipe 0.9 %w/v NaCl, 10 mM KH2PO4, 5 %w/v sucrose",
            "require rinse stays dissolved from 2 C to 8 C margin 10%",
            "which solids form in recipe 20 %w/w NaCl from -30 C to 20 C",
            "freezing of recipe 30 %w/w propylene glycol",
            "freezing of recipe 15 %w/w NaCl, 5 %w/w CaCl2 at -20 C",
        ],
    },
    Topic {
        name: "ph",
        aliases: &["buffer", "buffers"],
        summary: "buffers in recipes: the pH against temperature and on freezing",
        body: "ph of RECIPE from T1 to T2 [every STEP] [extrapolate]\n\
               A buffer in a recipe is its amount in a mol unit, its name and its pH: \
               `10 mM sodium phosphate at pH 7.4` (also potassium phosphate, citrate, \
               acetate, Tris-HCl, histidine, carbonate, borate). It becomes its forms in \
               the reference, in the shares that give that pH at 25 C, and every recipe \
               answer checks them. `ph of` gives the pH at each end and every 5 C \
               between (or every STEP), the amounts fixed; `freezing of RECIPE at T` follows the pH of the \
               liquid left as ice forms and warns past a shift of 0.5.",
        examples: &[
            "ph of recipe 10 mM sodium phosphate at pH 7.4, 137 mM NaCl from 2 C to 25 C",
            "ph of recipe 50 mmol/kg Tris-HCl at pH 8.0 from 4 C to 37 C",
            "freezing of recipe 10 mM sodium phosphate at pH 7.4, 137 mM NaCl at -20 C",
        ],
    },
    Topic {
        name: "units",
        aliases: &["unit", "quantities"],
        summary: "how to write temperatures, loadings and pressures",
        body: "A quantity is a number and a unit, and the unit decides what it is.",
        examples: &[],
    },
    Topic {
        name: "session",
        aliases: &[
            "commands", "settings", "output", "format", "keys", "forget", "quit", "clear",
        ],
        summary: "commands and keys of this session",
        body: "help [TOPIC]       this help, or one topic\n\
               output [FORMAT]    show answers as table, json or csv (alone: the current one)\n\
               forget             unbind every name bound with let\n\
               clear              clear the screen (so does Ctrl-L)\n\
               quit, exit         leave (so does Ctrl-D on an empty line)\n\
               A line ending in \\ continues on the next line. Tab completes keywords, units \
               and solute names; Ctrl-C drops the line being typed; the arrow keys walk \
               the history, which is kept between sessions (set SATLINE_HISTORY to choose \
               the file).",
        examples: &[],
    },
    Topic {
        name: "batch",
        aliases: &["run", "exit", "exit codes", "ci", "scripts"],
        summary: "running scripts from build tools",
        body: "satline run FILE... [--format table|json|csv]   (`-` reads standard input)\n\
               Statements end at a newline or `;`, `#` starts a comment. Exit codes: 0 every \
               statement answered and every require held; 1 a require did not hold; 2 a \
               statement could not be parsed or answered (each is reported as \
               file:line:column: message); 3 the database or a file could not be read.",
        examples: &[],
    },
    Topic {
        name: "caution",
        aliases: &["safety"],
        summary: "what the reference is for, and what it is not",
        body: crate::engine::CAUTION,
        examples: &[],
    },
];

/// The names of all topics, in overview order.
pub fn topic_names() -> Vec<&'static str> {
    TOPICS.iter().map(|t| t.name).collect()
}

/// Finds a topic by name or alias, ignoring case and extra spaces.
pub fn find(name: &str) -> Option<&'static Topic> {
    let wanted = name
        .split_whitespace()
        .collect::<Vec<_>>()
        .join(" ")
        .to_lowercase();
    TOPICS
        .iter()
        .find(|t| t.name == wanted || t.aliases.contains(&wanted.as_str()))
}

/// The text of `help`: one line per topic and how to ask for more.
pub fn overview() -> String {
    let width = TOPICS.iter().map(|t| t.name.len()).max().unwrap_or(0);
    let mut text = String::from(
        "Ask in plain words, one statement per line. For example:\n  \
         solubility of KNO3 at 20 C\n\nTopics (help TOPIC):\n",
    );
    for topic in TOPICS {
        text.push_str(&format!(
            "  {:width$}  {}\n",
            topic.name,
            topic.summary,
            width = width
        ));
    }
    text
}

/// The width help text is wrapped to: fits an 80-column terminal.
pub const WIDTH: usize = 78;

/// Wraps each line of `text` longer than `width` at spaces (a word longer than the width
/// stays whole). Lines that fit are left as they are, so aligned lines keep their spacing.
pub fn wrap(text: &str, width: usize) -> String {
    let mut wrapped = String::new();
    for line in text.lines() {
        if line.chars().count() <= width {
            wrapped.push_str(line);
            wrapped.push('\n');
            continue;
        }
        let mut current = String::new();
        for word in line.split_whitespace() {
            let needed = current.chars().count() + 1 + word.chars().count();
            if !current.is_empty() && needed > width {
                wrapped.push_str(&current);
                wrapped.push('\n');
                current.clear();
            }
            if !current.is_empty() {
                current.push(' ');
            }
            current.push_str(word);
        }
        wrapped.push_str(&current);
        wrapped.push('\n');
    }
    wrapped
}

/// The text of `help TOPIC`.
pub fn render(topic: &Topic) -> String {
    let mut text = wrap(topic.body, WIDTH);
    if topic.name == "units" {
        text.push_str(&units_text());
    }
    if !topic.examples.is_empty() {
        text.push_str(if topic.examples.len() == 1 {
            "Example:\n"
        } else {
            "Examples:\n"
        });
        for example in topic.examples {
            text.push_str("  ");
            text.push_str(example);
            text.push('\n');
        }
    }
    text
}

/// The unit symbols, from the one vocabulary of units, so help never disagrees with the
/// parser.
fn units_text() -> String {
    let join = |symbols: Vec<&str>| symbols.join(", ");
    let loadings = |per_litre: bool| {
        join(
            CompositionUnit::ALL
                .iter()
                .filter(|u| u.needs_density() == per_litre)
                .map(|u| u.symbol())
                .collect(),
        )
    };
    format!(
        "  temperatures: {}   (5 C, 278.15 K, 41 F)\n  \
         loadings:     {}\n  \
         per litre:    {}\n                (mM, uM, M too; per litre of solution at 20 C unless\n                 `at T` says; the density comes from Laliberté's model)\n  \
         pressures:    {}   (2.5 bar; or `under air`)\n  \
         margins:      a percentage of headroom, as in `margin 10%`\n  \
         masses:       {}   (a batch in `dissolving`: 300 g, 1 kg)\n",
        join(TemperatureUnit::ALL.iter().map(|u| u.symbol()).collect()),
        loadings(false),
        loadings(true),
        join(PressureUnit::ALL.iter().map(|u| u.symbol()).collect()),
        join(MassUnit::ALL.iter().map(|u| u.symbol()).collect()),
    )
}

/// Every example statement of every topic, in order (for tests that run them).
pub fn examples() -> impl Iterator<Item = &'static str> {
    TOPICS.iter().flat_map(|t| t.examples.iter().copied())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The acceptance set of DESIGN.md ("The query language").
    const ACCEPTANCE: [&str; 16] = [
        "solubility of KNO3 at 20 C",
        "solubility of potassium nitrate at 68 F in mol/kg",
        "which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%",
        "which solutes stay dissolved at 1.5 mol/kg at 5 C",
        "saturation of KNO3 at 40 g/100g water",
        "ceiling of KCl from 2 C to 8 C margin 10% in mol/kg",
        "heat of solution of KNO3 at 25 C",
        "dissolved O2 at 25 C under air",
        "dissolved CO2 at 4 C under 2.5 bar in g/L",
        "freezing of NaCl at 10 g/100g water at -10 C",
        "convert 20 g/100g water of KCl to mol/kg",
        "describe NaCl",
        "sources of NaCl",
        "list salts with anion sulfate",
        "let cold = from 2 C to 8 C",
        "require KCl stays dissolved at 20 g/100g water over cold margin 10%",
    ];

    #[test]
    fn every_acceptance_statement_is_an_example() {
        let examples: Vec<&str> = examples().collect();
        for statement in ACCEPTANCE {
            assert!(examples.contains(&statement), "no help shows `{statement}`");
        }
    }

    #[test]
    fn names_and_aliases_are_unique() {
        let mut seen = std::collections::BTreeSet::new();
        for topic in TOPICS {
            for word in std::iter::once(&topic.name).chain(topic.aliases) {
                assert!(seen.insert(*word), "`{word}` names two topics");
                assert_eq!(find(word).map(|t| t.name), Some(topic.name));
            }
        }
    }

    #[test]
    fn finds_topics_loosely() {
        assert_eq!(find("REQUIRE").map(|t| t.name), Some("require"));
        assert_eq!(find("heat   of solution").map(|t| t.name), Some("heat"));
        assert_eq!(find("gas").map(|t| t.name), Some("dissolved"));
        assert!(find("nothing").is_none());
    }

    #[test]
    fn wraps_long_lines_only() {
        assert_eq!(wrap("a bb ccc dddd", 6), "a bb\nccc\ndddd\n");
        assert_eq!(wrap("short  spaced\nx", 20), "short  spaced\nx\n");
        for topic in TOPICS {
            for line in render(topic).lines() {
                assert!(line.chars().count() <= WIDTH, "too long: {line}");
            }
        }
    }

    #[test]
    fn overview_lists_every_topic() {
        let text = overview();
        for topic in TOPICS {
            assert!(text.contains(topic.name));
        }
    }

    #[test]
    fn units_topic_lists_the_vocabulary() {
        let text = render(find("units").unwrap());
        assert!(text.contains("g/100g water"));
        assert!(text.contains("mmHg"));
        let require = render(find("require").unwrap());
        assert!(require.contains("Examples:\n  let cold = from 2 C to 8 C\n"));
    }
}
