//! Pictures of curves (issue 8): the SVG parses as XML and holds one series per solute and
//! solid phase, the axis labels and the legend entries; a PNG decodes to the size asked for;
//! a plot of an unknown solute is an error, never an empty picture; the command line writes
//! the file named by `--out`, numbers further plots and refuses an unknown extension.

use std::process::Command;

use assert_cmd::cargo::CommandCargoExt;
use satline::answer::AnswerKind;
use satline::engine::Engine;
use satline::plot::{self, Format, PlotRequestError, palette};

fn engine() -> Engine {
    Engine::open_embedded().unwrap()
}

/// The text of every `<text>` element of an SVG, whitespace trimmed.
fn texts(doc: &roxmltree::Document) -> Vec<String> {
    doc.descendants()
        .filter(|n| n.has_tag_name("text"))
        .map(|n| n.text().unwrap_or("").trim().to_string())
        .collect()
}

/// How many line elements are stroked in a colour (`#RRGGBB`).
fn lines_in(doc: &roxmltree::Document, colour: &str) -> usize {
    doc.descendants()
        .filter(|n| n.has_tag_name("polyline") || n.has_tag_name("path") || n.has_tag_name("line"))
        .filter(|n| {
            n.attribute("stroke")
                .is_some_and(|s| s.eq_ignore_ascii_case(colour))
        })
        .count()
}

#[test]
fn svg_holds_a_series_per_solute_and_phase_axis_labels_and_legend() {
    let engine = engine();
    let svg = plot::svg_for(&engine.run_text(
        "plot KNO3, KCl, Na2SO4 from 0 C to 60 C",
        &mut engine.session(),
    ))
    .unwrap();
    let doc = roxmltree::Document::parse(&svg).expect("the SVG is well-formed XML");
    assert_eq!(doc.root_element().tag_name().name(), "svg");
    assert_eq!(doc.root_element().attribute("width"), Some("800"));
    let texts = texts(&doc);
    for wanted in [
        "temperature (°C)",
        "solubility (g/100g water, anhydrous solute)",
        "potassium nitrate: solid KNO₃",
        "potassium chloride: solid KCl",
        "sodium sulfate: solid Na₂SO₄·10H₂O",
        "sodium sulfate: solid Na₂SO₄",
        "data: Perry et al. 1997",
    ] {
        assert!(
            texts.iter().any(|t| t == wanted),
            "no text `{wanted}` in {texts:?}"
        );
    }
    assert!(
        texts
            .iter()
            .any(|t| t == "Solubility in water: KNO₃, KCl, Na₂SO₄")
    );
    // Four series (sodium sulfate has two solid phases), each in its own colour, and no
    // fifth colour of the palette is used for a line.
    for index in 0..4 {
        assert!(
            lines_in(&doc, &palette::hex(index)) >= 1,
            "no line in the colour of series {index}"
        );
    }
    assert_eq!(lines_in(&doc, &palette::hex(4)), 0);
    // The transition of sodium sulfate is marked.
    assert!(
        texts
            .iter()
            .any(|t| t.starts_with("Na₂SO₄·10H₂O → Na₂SO₄ at")),
        "{texts:?}"
    );
}

#[test]
fn the_answer_rows_describe_the_series() {
    let engine = engine();
    let mut session = engine.session();
    let answers = engine.run_text("plot Na2SO4 from 0 C to 60 C", &mut session);
    let answer = &answers[0];
    assert!(answer.ok, "{:?}", answer.error);
    assert_eq!(answer.kind, AnswerKind::Plot);
    let curves: Vec<_> = answer
        .rows
        .iter()
        .filter(|r| r.quantity.as_deref() == Some("curve"))
        .collect();
    assert_eq!(curves.len(), 2);
    assert_eq!(curves[0].phase.as_deref(), Some("Na2SO4·10H2O"));
    assert_eq!(curves[0].extra["points"], 4);
    assert!(
        answer
            .rows
            .iter()
            .any(|r| r.quantity.as_deref() == Some("transition"))
    );
    assert!(!answer.sources.is_empty());
    let json = serde_json::to_value(answer).unwrap();
    assert_eq!(json["kind"], "plot");
    assert!(
        json.get("plot").is_none(),
        "the drawing data stay out of the JSON"
    );
}

#[test]
fn a_loading_draws_its_line_and_limiting_point() {
    let engine = engine();
    let text = "plot KCl from 0 C to 40 C with loading 30 g/100g water from 2 C to 8 C";
    let svg = plot::svg_for(&engine.run_text(text, &mut engine.session())).unwrap();
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let texts = texts(&doc);
    assert!(
        texts.iter().any(|t| t == "loading 30 g/100g water"),
        "{texts:?}"
    );
    assert!(
        texts.iter().any(|t| t == "storage range 2 °C to 8 °C"),
        "{texts:?}"
    );
    assert!(texts.iter().any(|t| t.starts_with("KCl: ")), "{texts:?}");
    let mut session = engine.session();
    let answer = &engine.run_text(text, &mut session)[0];
    let limiting = answer.rows.iter().find(|r| r.holds.is_some()).unwrap();
    assert_eq!(limiting.temperature_c, Some(2.0));
}

#[test]
fn gases_are_drawn_against_temperature_at_a_pressure() {
    let engine = engine();
    let svg = plot::svg_for(&engine.run_text(
        "plot O2, N2 from 0 C to 40 C under air",
        &mut engine.session(),
    ))
    .unwrap();
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let texts = texts(&doc);
    assert!(texts.iter().any(|t| t == "oxygen (O₂)"), "{texts:?}");
    assert!(
        texts.iter().any(|t| t == "dissolved gas (mg/L)"),
        "{texts:?}"
    );
    assert!(lines_in(&doc, &palette::hex(1)) >= 1);
}

#[test]
fn png_decodes_to_the_size_asked_for() {
    let engine = engine();
    let (bytes, _) = plot::picture_for(
        &engine.run_text("plot KNO3 from 0 C to 100 C", &mut engine.session()),
        Format::Png,
        640,
        400,
    )
    .unwrap();
    let decoder = png::Decoder::new(std::io::Cursor::new(bytes));
    let reader = decoder.read_info().unwrap();
    let info = reader.info();
    assert_eq!((info.width, info.height), (640, 400));
}

#[test]
fn unknown_solutes_and_other_statements_are_errors_not_pictures() {
    let engine = engine();
    let Err(PlotRequestError::Unanswered { answer }) =
        plot::svg_for(&engine.run_text("plot KNO4 from 0 C to 100 C", &mut engine.session()))
    else {
        panic!("an unknown solute must be an error");
    };
    let error = answer.error.unwrap();
    assert_eq!(error.code, "unknown-solute");
    assert!(
        error.message.contains("did you mean") && error.message.contains("KNO3"),
        "{}",
        error.message
    );
    assert_eq!(error.column, 6);
    assert!(matches!(
        plot::svg_for(&engine.run_text("solubility of KNO3 at 20 C", &mut engine.session())),
        Err(PlotRequestError::NotOnePlot { .. })
    ));
    // A solid and a gas in one picture, and a range with no data.
    assert!(
        plot::svg_for(&engine.run_text("plot KCl, O2 from 0 C to 40 C", &mut engine.session()))
            .is_err()
    );
    let Err(PlotRequestError::Unanswered { answer }) =
        plot::svg_for(&engine.run_text("plot KNO3 from 150 C to 200 C", &mut engine.session()))
    else {
        panic!("no data in the range must be an error");
    };
    assert!(answer.error.unwrap().message.contains("extrapolate"));
}

fn satline(dir: &std::path::Path) -> Command {
    let mut command = Command::cargo_bin("satline").unwrap();
    // A data directory of its own, so the user's default database is never touched.
    command
        .current_dir(dir)
        .env_remove("SATLINE_DB")
        .env("XDG_DATA_HOME", dir.join("data"))
        .env("HOME", dir);
    command
}

#[test]
fn the_command_line_writes_the_picture_named_by_out() {
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path())
        .args(["plot KNO3, KCl from 0 C to 100 C", "--out", "curve.svg"])
        .output()
        .unwrap();
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let svg = std::fs::read_to_string(dir.path().join("curve.svg")).unwrap();
    roxmltree::Document::parse(&svg).unwrap();
    assert!(String::from_utf8_lossy(&out.stdout).contains("picture written to curve.svg"));
}

#[test]
fn several_plots_get_numbered_files_and_json_names_them() {
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path())
        .args([
            "plot KNO3 from 0 C to 100 C",
            "plot O2 from 0 C to 40 C",
            "--out",
            "curve.png",
            "--format",
            "json",
        ])
        .output()
        .unwrap();
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(dir.path().join("curve.png").is_file());
    assert!(dir.path().join("curve-2.png").is_file());
    let stdout = String::from_utf8_lossy(&out.stdout);
    let second: serde_json::Value = serde_json::from_str(stdout.lines().nth(1).unwrap()).unwrap();
    assert_eq!(second["picture"], "curve-2.png");
}

#[test]
fn an_unknown_extension_is_refused_before_any_work() {
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path())
        .args(["plot KNO3 from 0 C to 100 C", "--out", "curve.jpg"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stderr.contains("not `.jpg`"), "{stderr}");
    assert!(out.stdout.is_empty());
}

#[test]
fn an_unknown_solute_writes_no_file_and_exits_2() {
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path())
        .args(["plot KNO4 from 0 C to 100 C", "--out", "curve.svg"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(!dir.path().join("curve.svg").exists());
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(
        stderr.contains("did you mean") && stderr.contains("KNO3"),
        "{stderr}"
    );
}

#[test]
fn out_without_a_plot_statement_is_an_error() {
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path())
        .args(["solubility of KNO3 at 20 C", "--out", "curve.svg"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stderr.contains("no plot statement"), "{stderr}");
    assert!(!dir.path().join("curve.svg").exists());
}

#[test]
fn the_text_sketch_comes_with_the_table() {
    let dir = tempfile::tempdir().unwrap();
    let out = satline(dir.path())
        .arg("plot KNO3 from 0 C to 100 C")
        .output()
        .unwrap();
    let stdout = String::from_utf8_lossy(&out.stdout);
    assert!(
        stdout.contains("* potassium nitrate: solid KNO3"),
        "{stdout}"
    );
    assert!(stdout.contains("temperature (°C)"), "{stdout}");
}

/// The y of a `<text>` element whose text is `wanted`.
fn text_y(doc: &roxmltree::Document, wanted: &str) -> Option<f64> {
    doc.descendants()
        .filter(|n| n.has_tag_name("text"))
        .find(|n| n.text().unwrap_or("").trim() == wanted)
        .and_then(|n| n.attribute("y"))
        .and_then(|y| y.parse().ok())
}

/// The font size of a `<text>` element whose text is `wanted`.
fn text_size(doc: &roxmltree::Document, wanted: &str) -> Option<f64> {
    doc.descendants()
        .filter(|n| n.has_tag_name("text"))
        .find(|n| n.text().unwrap_or("").trim() == wanted)
        .and_then(|n| n.attribute("font-size"))
        .and_then(|s| s.trim_end_matches("px").parse().ok())
}

#[test]
fn the_legend_sits_under_the_plot_and_states_the_margin() {
    let engine = engine();
    let text = "plot KCl, NaCl from 0 C to 40 C with loading 30 g/100g water from 2 C to 8 C \
                margin 10%";
    let svg = plot::svg_for(&engine.run_text(text, &mut engine.session())).unwrap();
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let texts = texts(&doc);
    // The margin's line is named with its value.
    let margin = texts
        .iter()
        .find(|t| t.starts_with("loading raised by the 10% margin: "))
        .unwrap_or_else(|| panic!("{texts:?}"));
    assert!(margin.ends_with(" g/100g water"), "{margin}");
    // Every legend entry is below the temperature axis's label: outside the plot area, so
    // it covers no curve, point or label.
    let axis = text_y(&doc, "temperature (°C)").unwrap();
    for entry in [
        "loading 30 g/100g water",
        "potassium chloride: solid KCl",
        margin.as_str(),
    ] {
        let y = text_y(&doc, entry).unwrap();
        assert!(
            y > axis,
            "`{entry}` at y {y}, above the axis label at {axis}"
        );
    }
    // The margin is drawn dashed in the plot and in the legend alike: in black, thin, more
    // than one piece for each.
    let thin_black = doc
        .descendants()
        .filter(|n| {
            n.attribute("stroke")
                .is_some_and(|s| s.eq_ignore_ascii_case("#000000"))
        })
        .filter(|n| n.attribute("stroke-width") == Some("1"))
        .count();
    assert!(thin_black > 4, "{thin_black}");
}

#[test]
fn the_footnote_cites_sources_short_and_says_the_state_of_the_data() {
    let engine = engine();
    let svg = plot::svg_for(&engine.run_text("plot KNO3 from 0 C to 100 C", &mut engine.session()))
        .unwrap();
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let all = texts(&doc).join(" ");
    assert!(
        all.contains("Perry et al. 1997 (perry-7-solubility)"),
        "{all}"
    );
    assert!(
        all.contains("Typed from memory of the cited tables"),
        "{all}"
    );
    assert!(all.contains("Unreviewed data: potassium nitrate"), "{all}");
}

#[test]
fn text_grows_with_the_picture_and_the_svg_carries_its_font() {
    let engine = engine();
    let answers = engine.run_text("plot KNO3 from 0 C to 100 C", &mut engine.session());
    let (small, _) = plot::picture_for(&answers, Format::Svg, 800, 500).unwrap();
    let (large, _) = plot::picture_for(&answers, Format::Svg, 1600, 1000).unwrap();
    let small = String::from_utf8(small).unwrap();
    let large = String::from_utf8(large).unwrap();
    let small_doc = roxmltree::Document::parse(&small).unwrap();
    let large_doc = roxmltree::Document::parse(&large).unwrap();
    let label = "temperature (°C)";
    let (a, b) = (
        text_size(&small_doc, label).unwrap(),
        text_size(&large_doc, label).unwrap(),
    );
    assert!((b / a - 2.0).abs() < 0.1, "{a} then {b}");
    // The font the text names is in the file itself.
    assert!(small.contains("@font-face{font-family:'DejaVu Sans';src:url(data:font/ttf;base64,"));
    assert!(small.contains("font-family=\"DejaVu Sans\""));
}
