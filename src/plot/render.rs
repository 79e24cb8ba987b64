//! Draws a `PlotSpec` with plotters: SVG through its SVG backend, PNG through its bitmap
//! backend and the `png` encoder. Text uses the embedded DejaVu Sans (see `font`), so the
//! picture needs no system font; an SVG carries the font in itself. Text and lines grow with
//! the picture's size; the legend sits in rows under the plot, where it covers nothing, and
//! the footnote under it names the sources and the state of the data.

use plotters::coord::Shift;
use plotters::prelude::*;

use super::error::PlotError;
use super::font;
use super::palette::{self, Shape};
use super::spec::PlotSpec;
use super::text::{self, subscripts};

/// Smallest and largest side of a picture, pixels.
pub const MIN_SIDE: u32 = 200;
pub const MAX_SIDE: u32 = 4000;

/// The size a picture has unless another is asked for: readable on a laptop screen.
pub const DEFAULT_SIZE: (u32, u32) = (800, 500);

/// Picture formats.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Format {
    Svg,
    Png,
}

impl Format {
    /// The format a file name's extension asks for (`.svg`, `.png`, any case).
    pub fn from_path(path: &std::path::Path) -> Result<Format, PlotError> {
        let extension = path
            .extension()
            .and_then(|e| e.to_str())
            .map(str::to_ascii_lowercase);
        match extension.as_deref() {
            Some("svg") => Ok(Format::Svg),
            Some("png") => Ok(Format::Png),
            Some(other) => Err(PlotError::UnknownExtension {
                path: path.display().to_string(),
                extension: format!(".{other}"),
            }),
            None => Err(PlotError::UnknownExtension {
                path: path.display().to_string(),
                extension: String::new(),
            }),
        }
    }

    /// The media type, for the server: `image/svg+xml`, `image/png`.
    pub fn media_type(self) -> &'static str {
        match self {
            Format::Svg => "image/svg+xml",
            Format::Png => "image/png",
        }
    }

    pub fn name(self) -> &'static str {
        match self {
            Format::Svg => "SVG",
            Format::Png => "PNG",
        }
    }
}

fn check_size(width: u32, height: u32) -> Result<(), PlotError> {
    let fits = |side: u32| (MIN_SIDE..=MAX_SIDE).contains(&side);
    if fits(width) && fits(height) {
        Ok(())
    } else {
        Err(PlotError::BadSize { width, height })
    }
}

/// The picture as the bytes of an SVG or PNG file, `width` × `height` pixels.
pub fn render(
    spec: &PlotSpec,
    format: Format,
    width: u32,
    height: u32,
) -> Result<Vec<u8>, PlotError> {
    match format {
        Format::Svg => svg(spec, width, height).map(String::into_bytes),
        Format::Png => png(spec, width, height),
    }
}

/// The picture as SVG text.
pub fn svg(spec: &PlotSpec, width: u32, height: u32) -> Result<String, PlotError> {
    check_size(width, height)?;
    font::register()?;
    let mut text = String::new();
    {
        let root = SVGBackend::with_string(&mut text, (width, height)).into_drawing_area();
        draw(&root, spec).map_err(PlotError::Draw)?;
        root.present().map_err(|e| PlotError::Draw(e.to_string()))?;
    }
    Ok(font::embed_in_svg(&text))
}

/// The picture as a PNG file's bytes (8-bit RGB).
pub fn png(spec: &PlotSpec, width: u32, height: u32) -> Result<Vec<u8>, PlotError> {
    check_size(width, height)?;
    font::register()?;
    let mut pixels = vec![0u8; width as usize * height as usize * 3];
    {
        let backend = BitMapBackend::with_buffer(&mut pixels, (width, height));
        let root = super::glyphs::TrueText(backend).into_drawing_area();
        draw(&root, spec).map_err(PlotError::Draw)?;
        root.present().map_err(|e| PlotError::Draw(e.to_string()))?;
    }
    let mut bytes = Vec::new();
    {
        let mut encoder = ::png::Encoder::new(&mut bytes, width, height);
        encoder.set_color(::png::ColorType::Rgb);
        encoder.set_depth(::png::BitDepth::Eight);
        let mut writer = encoder
            .write_header()
            .map_err(|e| PlotError::Encode(e.to_string()))?;
        writer
            .write_image_data(&pixels)
            .map_err(|e| PlotError::Encode(e.to_string()))?;
        writer
            .finish()
            .map_err(|e| PlotError::Encode(e.to_string()))?;
    }
    Ok(bytes)
}

fn rgb(index: usize) -> RGBColor {
    let (r, g, b) = palette::colour(index);
    RGBColor(r, g, b)
}

const GREY: RGBColor = RGBColor(90, 90, 90);

fn sans(size: u32) -> TextStyle<'static> {
    TextStyle::from((font::FAMILY, size).into_font())
}

/// What a legend entry shows before its text: the line, band or marker as the plot draws it.
#[derive(Debug, Clone, Copy)]
enum Mark {
    /// A line of `width` (base pixels), dashed with (dash, gap) when given.
    Line {
        colour: RGBColor,
        width: u32,
        dash: Option<(u32, u32)>,
    },
    /// The storage range's band.
    Band,
    /// A source's marker shape, in grey.
    Marker(Shape),
}

/// The legend's entries, in the order the plot draws them.
fn legend_entries(spec: &PlotSpec) -> Vec<(Mark, String)> {
    let mut entries = Vec::new();
    if let Some(loading) = &spec.loading {
        let (s0, s1) = loading.storage;
        entries.push((
            Mark::Band,
            format!("storage range {} °C to {} °C", figure(s0), figure(s1)),
        ));
    }
    for series in &spec.series {
        let dash = series
            .segments
            .iter()
            .all(|g| g.extrapolated)
            .then_some((9, 6));
        entries.push((
            Mark::Line {
                colour: rgb(series.colour),
                width: 2,
                dash,
            },
            subscripts(&series.label),
        ));
    }
    let mut shown: Vec<&str> = Vec::new();
    for set in &spec.points {
        if !shown.contains(&set.source.as_str()) {
            shown.push(&set.source);
            entries.push((Mark::Marker(palette::shape(set.shape)), set.source.clone()));
        }
    }
    if let Some(loading) = &spec.loading {
        entries.push((
            Mark::Line {
                colour: BLACK,
                width: 2,
                dash: None,
            },
            loading.label.clone(),
        ));
        if loading.with_margin.is_some() {
            let label = loading
                .margin_label
                .clone()
                .unwrap_or_else(|| "loading raised by the margin".into());
            entries.push((
                Mark::Line {
                    colour: BLACK,
                    width: 1,
                    dash: Some(MARGIN_DASH),
                },
                label,
            ));
        }
    }
    entries
}

/// The dash and gap of the margin's line, in the plot and in the legend alike.
const MARGIN_DASH: (u32, u32) = (2, 4);

/// Draws one legend mark with its left edge at `x`, centred on `y`; `k` scales pixels.
fn draw_mark<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    mark: Mark,
    (x, y): (i32, i32),
    k: f64,
) -> Result<(), DrawingAreaErrorKind<DB::ErrorType>> {
    let px = |n: f64| (n * k).round() as i32;
    let grey = ShapeStyle::from(GREY);
    match mark {
        Mark::Line {
            colour,
            width,
            dash,
        } => {
            let style = colour.stroke_width(((f64::from(width)) * k).round().max(1.0) as u32);
            match dash {
                None => area.draw(&PathElement::new(vec![(x, y), (x + px(24.0), y)], style)),
                Some((on, off)) => {
                    let (on, off) = (px(f64::from(on)).max(1), px(f64::from(off)).max(1));
                    let mut at = x;
                    while at < x + px(24.0) {
                        let end = (at + on).min(x + px(24.0));
                        area.draw(&PathElement::new(vec![(at, y), (end, y)], style))?;
                        at += on + off;
                    }
                    Ok(())
                }
            }
        }
        Mark::Band => {
            let band = RGBColor(120, 120, 120).mix(0.13).filled();
            area.draw(&Rectangle::new(
                [(x, y - px(6.0)), (x + px(24.0), y + px(6.0))],
                band,
            ))
        }
        Mark::Marker(shape) => {
            let c = (x + px(12.0), y);
            match shape {
                Shape::Circle => area.draw(&Circle::new(c, px(4.0), grey.filled())),
                Shape::Triangle => area.draw(&TriangleMarker::new(c, px(5.0), grey.filled())),
                Shape::Square => area.draw(&Rectangle::new(
                    [
                        (c.0 - px(4.0), c.1 - px(4.0)),
                        (c.0 + px(4.0), c.1 + px(4.0)),
                    ],
                    grey.stroke_width(px(2.0).max(1) as u32),
                )),
                Shape::Cross => area.draw(&Cross::new(
                    c,
                    px(4.0),
                    grey.stroke_width(px(2.0).max(1) as u32),
                )),
            }
        }
    }
}

/// The legend laid out in rows under the plot: each entry's mark and text, placed left to
/// right and wrapped to the picture's width. Returns (x, row) of each entry and the rows.
fn legend_layout(entries: &[(Mark, String)], width: f64, k: f64) -> (Vec<(f64, usize)>, usize) {
    let per_char = 7.0 * k;
    let mut placed = Vec::new();
    let (mut x, mut row) = (0.0, 0);
    let margin = 16.0 * k;
    for (_, text) in entries {
        let w = 24.0 * k + 8.0 * k + text.chars().count() as f64 * per_char + 22.0 * k;
        if x > 0.0 && margin + x + w > width - margin {
            x = 0.0;
            row += 1;
        }
        placed.push((margin + x, row));
        x += w;
    }
    (placed, if entries.is_empty() { 0 } else { row + 1 })
}

/// Draws the whole picture on any plotters backend: the chart, the legend in rows under it
/// (where it covers nothing drawn), and the footnote lines.
fn draw<'a, DB: DrawingBackend + 'a>(
    root: &'a DrawingArea<DB, Shift>,
    spec: &PlotSpec,
) -> Result<(), String>
where
    DB::ErrorType: 'static,
{
    let e = |error: DrawingAreaErrorKind<DB::ErrorType>| error.to_string();
    root.fill(&WHITE).map_err(e)?;
    let (width, height) = root.dim_in_pixel();
    let k = text::scale(width, height);
    let size = |base: f64| (base * k).round().max(6.0) as u32;
    let px = |base: f64| (base * k).round() as i32;

    let entries = legend_entries(spec);
    let (placed, legend_rows) = legend_layout(&entries, f64::from(width), k);
    let row_h = 19.0 * k;
    let legend_h =
        (legend_rows as f64 * row_h + if legend_rows > 0 { 8.0 * k } else { 0.0 }).round() as u32;
    let foot_lines: Vec<String> = spec
        .footnote
        .lines()
        .flat_map(|l| text::wrap(l, f64::from(width) - 24.0 * k, 6.0 * k))
        .collect();
    let foot_h = (foot_lines.len() as f64 * 15.0 * k + 6.0 * k).round() as u32;
    let chart_h = height.saturating_sub(legend_h + foot_h).max(height / 2);
    let (upper, rest) = root.split_vertically(chart_h);
    let (legend_area, lower) = rest.split_vertically(legend_h);

    for (i, line) in foot_lines.iter().enumerate() {
        lower
            .draw(&Text::new(
                subscripts(line),
                (px(12.0), px(2.0 + 15.0 * i as f64)),
                sans(size(11.5)).color(&GREY),
            ))
            .map_err(e)?;
    }
    for ((mark, label), (x, row)) in entries.iter().zip(&placed) {
        let y = (*row as f64 * row_h + row_h / 2.0 + 2.0 * k).round() as i32;
        let x = x.round() as i32;
        draw_mark(&legend_area, *mark, (x, y), k).map_err(e)?;
        legend_area
            .draw(&Text::new(
                label.clone(),
                (x + px(32.0), y - px(7.0)),
                sans(size(13.0)).color(&BLACK),
            ))
            .map_err(e)?;
    }

    let (x0, x1) = spec.x_range;
    let x1 = if x1 > x0 { x1 } else { x0 + 1.0 };
    let (y0, y1) = spec.y_range();
    let mut chart = ChartBuilder::on(&upper)
        .caption(subscripts(&spec.title), sans(size(20.0)))
        .margin(px(14.0) as u32)
        .x_label_area_size(px(46.0) as u32)
        .y_label_area_size(px(72.0) as u32)
        .build_cartesian_2d(x0..x1, y0..y1)
        .map_err(e)?;
    chart
        .configure_mesh()
        .x_desc(spec.x_label.clone())
        .y_desc(spec.y_label.clone())
        .axis_desc_style(sans(size(15.0)))
        .label_style(sans(size(13.0)))
        .light_line_style(WHITE)
        .bold_line_style(RGBColor(225, 225, 225))
        .x_labels(11)
        .y_labels(8)
        .x_label_formatter(&|x| figure(*x))
        .y_label_formatter(&|y| label_value(*y))
        .draw()
        .map_err(e)?;
    let stroke = |base: u32| ((f64::from(base) * k).round().max(1.0)) as u32;

    // The storage range first, so every line lies on top of it.
    if let Some(loading) = &spec.loading {
        let (s0, s1) = loading.storage;
        let band = RGBColor(120, 120, 120).mix(0.13).filled();
        chart
            .draw_series(std::iter::once(Rectangle::new([(s0, y0), (s1, y1)], band)))
            .map_err(e)?;
    }

    for transition in &spec.transitions {
        let style = rgb(transition.colour).mix(0.8).stroke_width(stroke(1));
        let t = transition.temperature_c;
        chart
            .draw_series(DashedLineSeries::new(
                vec![(t, y0), (t, y1)],
                px(3.0).max(1) as u32,
                px(4.0).max(1) as u32,
                style,
            ))
            .map_err(e)?;
        let at = chart.backend_coord(&(t, y1));
        upper
            .draw(&Text::new(
                subscripts(&transition.label),
                (at.0 + px(5.0), at.1 + px(4.0)),
                sans(size(12.0)).color(&GREY),
            ))
            .map_err(e)?;
    }

    for series in &spec.series {
        let style = rgb(series.colour).stroke_width(stroke(2));
        for segment in &series.segments {
            if segment.extrapolated {
                chart
                    .draw_series(DashedLineSeries::new(
                        segment.points.clone(),
                        px(9.0).max(1) as u32,
                        px(6.0).max(1) as u32,
                        style,
                    ))
                    .map_err(e)?;
            } else {
                chart
                    .draw_series(LineSeries::new(segment.points.clone(), style))
                    .map_err(e)?;
            }
        }
    }

    for set in &spec.points {
        let style = ShapeStyle::from(rgb(set.colour));
        let points = set.points.iter().copied();
        let (r, t, sq) = (px(5.0), px(6.0), px(4.0));
        // One arm per shape: plotters' series want one concrete element type each.
        match palette::shape(set.shape) {
            Shape::Circle => {
                chart
                    .draw_series(points.map(|p| {
                        EmptyElement::at(p)
                            + Circle::new((0, 0), r, style.filled())
                            + Circle::new((0, 0), r, BLACK.stroke_width(1))
                    }))
                    .map_err(e)?;
            }
            Shape::Triangle => {
                chart
                    .draw_series(points.map(|p| {
                        EmptyElement::at(p)
                        // plotters fills a triangle marker whatever the style: a larger
                        // dark one behind gives the coloured one an outline.
                        + TriangleMarker::new((0, 0), t + 2, BLACK.filled())
                        + TriangleMarker::new((0, 0), t, style.filled())
                    }))
                    .map_err(e)?;
            }
            Shape::Square => {
                chart
                    .draw_series(points.map(|p| {
                        EmptyElement::at(p)
                            + Rectangle::new([(-sq, -sq), (sq, sq)], style.filled())
                            + Rectangle::new([(-sq, -sq), (sq, sq)], BLACK.stroke_width(1))
                    }))
                    .map_err(e)?;
            }
            Shape::Cross => {
                chart
                    .draw_series(points.map(|p| Cross::new(p, r, style.stroke_width(stroke(3)))))
                    .map_err(e)?;
            }
        }
    }

    if let Some(loading) = &spec.loading {
        let (s0, s1) = loading.storage;
        let line = BLACK.stroke_width(stroke(2));
        chart
            .draw_series(LineSeries::new(
                vec![(s0, loading.value), (s1, loading.value)],
                line,
            ))
            .map_err(e)?;
        if let Some(level) = loading.with_margin {
            let dotted = BLACK.stroke_width(stroke(1));
            chart
                .draw_series(DashedLineSeries::new(
                    vec![(s0, level), (s1, level)],
                    px(f64::from(MARGIN_DASH.0)).max(1) as u32,
                    px(f64::from(MARGIN_DASH.1)).max(1) as u32,
                    dotted,
                ))
                .map_err(e)?;
        }
        for limiting in &loading.limiting {
            let ring = rgb(limiting.colour).stroke_width(stroke(3));
            chart
                .draw_series(std::iter::once(Circle::new(
                    (limiting.temperature_c, limiting.value),
                    px(9.0),
                    ring,
                )))
                .map_err(e)?;
            let at = chart.backend_coord(&(limiting.temperature_c, limiting.value));
            let label = subscripts(&limiting.label);
            let style = sans(size(13.0)).color(&BLACK);
            let place = (at.0 + px(13.0), at.1 + px(6.0));
            // A white ground under the label, so the loading and margin lines it crosses do
            // not run through its letters.
            let (w, h) = upper.estimate_text_size(&label, &style).map_err(e)?;
            upper
                .draw(&Rectangle::new(
                    [
                        (place.0 - px(2.0), place.1 - px(1.0)),
                        (place.0 + w as i32 + px(2.0), place.1 + h as i32 + px(1.0)),
                    ],
                    WHITE.mix(0.85).filled(),
                ))
                .map_err(e)?;
            upper.draw(&Text::new(label, place, style)).map_err(e)?;
        }
    }
    Ok(())
}

/// A value for an axis label: three significant figures, shortest form.
fn label_value(y: f64) -> String {
    crate::number::display(crate::number::round_significant(y, 3))
}

/// A temperature for a label: at most one decimal.
fn figure(x: f64) -> String {
    crate::number::display((x * 10.0).round() / 10.0)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::plot::spec::{Segment, Series};

    fn tiny() -> PlotSpec {
        PlotSpec {
            title: "invented demo".into(),
            x_label: "temperature (°C)".into(),
            y_label: "value".into(),
            x_range: (0.0, 10.0),
            series: vec![Series {
                label: "invented".into(),
                solute: "invented".into(),
                phase: None,
                colour: 0,
                segments: vec![
                    Segment {
                        points: vec![(0.0, 1.0), (5.0, 2.0)],
                        extrapolated: false,
                    },
                    Segment {
                        points: vec![(5.0, 2.0), (10.0, 4.0)],
                        extrapolated: true,
                    },
                ],
            }],
            points: Vec::new(),
            transitions: Vec::new(),
            loading: None,
            footnote: "invented".into(),
        }
    }

    #[test]
    fn formats_by_extension_with_their_media_types() {
        let svg = Format::from_path(std::path::Path::new("a.svg")).unwrap();
        assert_eq!(svg.media_type(), "image/svg+xml");
        assert_eq!(
            Format::from_path(std::path::Path::new("a.PNG")).unwrap(),
            Format::Png
        );
        assert!(Format::from_path(std::path::Path::new("a")).is_err());
    }

    #[test]
    fn sizes_outside_the_limits_are_refused() {
        assert_eq!(
            svg(&tiny(), 100, 500),
            Err(PlotError::BadSize {
                width: 100,
                height: 500
            })
        );
    }

    #[test]
    fn a_dashed_segment_is_drawn_in_pieces() {
        let text = svg(&tiny(), 800, 500).unwrap();
        let colour = palette::hex(0);
        let lines = text.matches(&format!("stroke=\"{colour}\"")).count();
        // One solid line, many dashes, and the legend's sample.
        assert!(lines > 3, "{lines}");
        assert!(text.contains(">\ninvented\n<") || text.contains(">invented<"));
    }
}
