//! Draws a `PlotSpec` with plotters: SVG through its SVG backend, PNG through its bitmap
//! backend and the `png` encoder. Text uses the embedded DejaVu Sans (see `font`), so the
//! picture needs no system font.

use plotters::coord::Shift;
use plotters::prelude::*;

use super::error::PlotError;
use super::font;
use super::palette::{self, Shape};
use super::spec::PlotSpec;

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
    Ok(text)
}

/// The picture as a PNG file's bytes (8-bit RGB).
pub fn png(spec: &PlotSpec, width: u32, height: u32) -> Result<Vec<u8>, PlotError> {
    check_size(width, height)?;
    font::register()?;
    let mut pixels = vec![0u8; width as usize * height as usize * 3];
    {
        let root = BitMapBackend::with_buffer(&mut pixels, (width, height)).into_drawing_area();
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

/// Draws the whole picture on any plotters backend.
fn draw<'a, DB: DrawingBackend + 'a>(
    root: &'a DrawingArea<DB, Shift>,
    spec: &PlotSpec,
) -> Result<(), String>
where
    DB::ErrorType: 'static,
{
    let e = |error: DrawingAreaErrorKind<DB::ErrorType>| error.to_string();
    root.fill(&WHITE).map_err(e)?;
    let (_, height) = root.dim_in_pixel();
    let footnote_height = 26.min(height / 5);
    let (upper, lower) = root.split_vertically(height.saturating_sub(footnote_height));
    lower
        .draw(&Text::new(
            spec.footnote.clone(),
            (12, 4),
            sans(12).color(&GREY),
        ))
        .map_err(e)?;

    let (x0, x1) = spec.x_range;
    let x1 = if x1 > x0 { x1 } else { x0 + 1.0 };
    let (y0, y1) = spec.y_range();
    let mut chart = ChartBuilder::on(&upper)
        .caption(spec.title.clone(), sans(20))
        .margin(14)
        .x_label_area_size(46)
        .y_label_area_size(72)
        .build_cartesian_2d(x0..x1, y0..y1)
        .map_err(e)?;
    chart
        .configure_mesh()
        .x_desc(spec.x_label.clone())
        .y_desc(spec.y_label.clone())
        .axis_desc_style(sans(15))
        .label_style(sans(13))
        .light_line_style(WHITE)
        .bold_line_style(RGBColor(225, 225, 225))
        .x_labels(11)
        .y_labels(8)
        .x_label_formatter(&|x| figure(*x))
        .y_label_formatter(&|y| label_value(*y))
        .draw()
        .map_err(e)?;

    // The storage range first, so every line lies on top of it.
    if let Some(loading) = &spec.loading {
        let (s0, s1) = loading.storage;
        let band = RGBColor(120, 120, 120).mix(0.13).filled();
        chart
            .draw_series(std::iter::once(Rectangle::new([(s0, y0), (s1, y1)], band)))
            .map_err(e)?
            .label(format!(
                "storage range {} C to {} C",
                figure(s0),
                figure(s1)
            ))
            .legend(move |(x, y)| Rectangle::new([(x, y - 6), (x + 20, y + 6)], band));
    }

    for transition in &spec.transitions {
        let style = rgb(transition.colour).mix(0.8).stroke_width(1);
        let t = transition.temperature_c;
        chart
            .draw_series(DashedLineSeries::new(vec![(t, y0), (t, y1)], 3, 4, style))
            .map_err(e)?;
        let at = chart.backend_coord(&(t, y1));
        upper
            .draw(&Text::new(
                transition.label.clone(),
                (at.0 + 5, at.1 + 4),
                sans(12).color(&GREY),
            ))
            .map_err(e)?;
    }

    for series in &spec.series {
        let solid = rgb(series.colour).stroke_width(2);
        let dashed = rgb(series.colour).stroke_width(2);
        let mut labelled = false;
        for segment in &series.segments {
            let drawn = if segment.extrapolated {
                chart
                    .draw_series(DashedLineSeries::new(segment.points.clone(), 9, 6, dashed))
                    .map_err(e)?
            } else {
                chart
                    .draw_series(LineSeries::new(segment.points.clone(), solid))
                    .map_err(e)?
            };
            if !labelled {
                labelled = true;
                drawn
                    .label(series.label.clone())
                    .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], solid));
            }
        }
    }

    let mut shown_sources: Vec<&str> = Vec::new();
    for set in &spec.points {
        let style = ShapeStyle::from(rgb(set.colour));
        let grey = ShapeStyle::from(GREY);
        let points = set.points.iter().copied();
        let first = !shown_sources.contains(&set.source.as_str());
        if first {
            shown_sources.push(&set.source);
        }
        let source = set.source.clone();
        // One arm per shape: plotters' series want one concrete element type each.
        match palette::shape(set.shape) {
            Shape::Circle => {
                let anno = chart
                    .draw_series(points.map(|p| {
                        EmptyElement::at(p)
                            + Circle::new((0, 0), 5, style.filled())
                            + Circle::new((0, 0), 5, BLACK.stroke_width(1))
                    }))
                    .map_err(e)?;
                if first {
                    anno.label(source)
                        .legend(move |(x, y)| Circle::new((x + 10, y), 4, grey.filled()));
                }
            }
            Shape::Triangle => {
                let anno = chart
                    .draw_series(points.map(|p| {
                        EmptyElement::at(p)
                        // plotters fills a triangle marker whatever the style: a larger
                        // dark one behind gives the coloured one an outline.
                        + TriangleMarker::new((0, 0), 8, BLACK.filled())
                        + TriangleMarker::new((0, 0), 6, style.filled())
                    }))
                    .map_err(e)?;
                if first {
                    anno.label(source)
                        .legend(move |(x, y)| TriangleMarker::new((x + 10, y), 5, grey.filled()));
                }
            }
            Shape::Square => {
                let anno = chart
                    .draw_series(points.map(|p| {
                        EmptyElement::at(p)
                            + Rectangle::new([(-4, -4), (4, 4)], style.filled())
                            + Rectangle::new([(-4, -4), (4, 4)], BLACK.stroke_width(1))
                    }))
                    .map_err(e)?;
                if first {
                    anno.label(source).legend(move |(x, y)| {
                        Rectangle::new([(x + 6, y - 4), (x + 14, y + 4)], grey.stroke_width(2))
                    });
                }
            }
            Shape::Cross => {
                let anno = chart
                    .draw_series(points.map(|p| Cross::new(p, 5, style.stroke_width(3))))
                    .map_err(e)?;
                if first {
                    anno.label(source)
                        .legend(move |(x, y)| Cross::new((x + 10, y), 4, grey.stroke_width(2)));
                }
            }
        }
    }

    if let Some(loading) = &spec.loading {
        let (s0, s1) = loading.storage;
        let line = BLACK.stroke_width(2);
        chart
            .draw_series(LineSeries::new(
                vec![(s0, loading.value), (s1, loading.value)],
                line,
            ))
            .map_err(e)?
            .label(loading.label.clone())
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], line));
        if let Some(level) = loading.with_margin {
            let dotted = BLACK.stroke_width(1);
            chart
                .draw_series(DashedLineSeries::new(
                    vec![(s0, level), (s1, level)],
                    2,
                    4,
                    dotted,
                ))
                .map_err(e)?
                .label("loading raised by the margin")
                .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], dotted));
        }
        for limiting in &loading.limiting {
            let ring = rgb(limiting.colour).stroke_width(3);
            chart
                .draw_series(std::iter::once(Circle::new(
                    (limiting.temperature_c, limiting.value),
                    9,
                    ring,
                )))
                .map_err(e)?;
            let at = chart.backend_coord(&(limiting.temperature_c, limiting.value));
            upper
                .draw(&Text::new(
                    limiting.label.clone(),
                    (at.0 + 13, at.1 + 6),
                    sans(13).color(&BLACK),
                ))
                .map_err(e)?;
        }
    }

    let (area_w, area_h) = chart.plotting_area().dim_in_pixel();
    chart
        .configure_series_labels()
        .position(legend_corner(spec, area_w, area_h, (y0, y1)))
        .background_style(WHITE.mix(0.88))
        .border_style(RGBColor(160, 160, 160))
        .label_font(sans(13))
        .margin(10)
        .draw()
        .map_err(e)?;
    Ok(())
}

/// The corner of the plotting area where the legend hides the fewest things drawn: the
/// legend's size is estimated from its entries (about 17 pixels a line, 7 a character).
fn legend_corner(spec: &PlotSpec, width: u32, height: u32, y: (f64, f64)) -> SeriesLabelPosition {
    let mut labels: Vec<usize> = spec
        .series
        .iter()
        .map(|s| s.label.chars().count())
        .collect();
    let mut sources: Vec<&str> = spec.points.iter().map(|p| p.source.as_str()).collect();
    sources.sort_unstable();
    sources.dedup();
    labels.extend(sources.iter().map(|s| s.chars().count()));
    let mut things: Vec<(f64, f64)> = Vec::new();
    for series in &spec.series {
        for segment in &series.segments {
            things.extend(segment.points.iter().copied());
        }
    }
    for set in &spec.points {
        things.extend(set.points.iter().copied());
    }
    let (x0, x1) = spec.x_range;
    for transition in &spec.transitions {
        // The dashed line, and its label running right along the top.
        let chars = transition.label.chars().count() as f64;
        let label_w = chars * 7.0 / f64::from(width.max(1)) * (x1 - x0);
        for k in 0..=10 {
            let f = f64::from(k) / 10.0;
            things.push((transition.temperature_c, y.0 + (y.1 - y.0) * f));
            things.push((
                transition.temperature_c + label_w * f,
                y.1 - (y.1 - y.0) * 0.03,
            ));
        }
    }
    if let Some(loading) = &spec.loading {
        labels.extend([26, loading.label.chars().count(), 29]);
        let (a, b) = loading.storage;
        for k in 0..=20 {
            things.push((a + (b - a) * f64::from(k) / 20.0, loading.value));
        }
        for limiting in &loading.limiting {
            // A limiting point's label runs to its right.
            for k in 0..=12 {
                let dx = (spec.x_range.1 - spec.x_range.0) * 0.03 * f64::from(k);
                things.push((limiting.temperature_c + dx, limiting.value));
            }
        }
    }
    let longest = labels.iter().copied().max().unwrap_or(10) as f64;
    let box_w = ((longest * 7.0 + 60.0) / f64::from(width.max(1))).min(1.0);
    let box_h = ((labels.len() as f64 * 17.0 + 24.0) / f64::from(height.max(1))).min(1.0);
    let span_x = (x1 - x0).max(1e-9);
    let span_y = (y.1 - y.0).max(1e-9);
    let covered = |left: bool, top: bool| {
        things
            .iter()
            .filter(|(t, v)| {
                let fx = (t - x0) / span_x;
                let fy = (v - y.0) / span_y;
                let in_x = if left { fx <= box_w } else { fx >= 1.0 - box_w };
                let in_y = if top { fy >= 1.0 - box_h } else { fy <= box_h };
                in_x && in_y
            })
            .count()
    };
    [
        (SeriesLabelPosition::UpperLeft, covered(true, true)),
        (SeriesLabelPosition::UpperRight, covered(false, true)),
        (SeriesLabelPosition::LowerRight, covered(false, false)),
        (SeriesLabelPosition::LowerLeft, covered(true, false)),
    ]
    .into_iter()
    .min_by_key(|(_, n)| *n)
    .map_or(SeriesLabelPosition::UpperLeft, |(corner, _)| corner)
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
