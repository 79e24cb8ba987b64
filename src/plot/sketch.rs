//! A quick text sketch of a `PlotSpec` for the terminal: each series drawn with its own
//! character (extrapolated stretches with `.`), transitions as `:` columns, the loading as
//! `=` over the storage range and limiting points as `L`; axis labels, the value range and
//! a legend below. Tabulated points are left to the picture files.

use super::palette::glyph;
use super::spec::PlotSpec;
use crate::number::{display, round_significant};

/// Columns and rows of the drawing area of a sketch.
pub const COLUMNS: usize = 60;
pub const ROWS: usize = 15;

struct Grid {
    cells: Vec<Vec<char>>,
    x: (f64, f64),
    y: (f64, f64),
}

impl Grid {
    fn column(&self, t: f64) -> Option<usize> {
        let f = (t - self.x.0) / (self.x.1 - self.x.0);
        (f.is_finite() && (-1e-9..=1.0 + 1e-9).contains(&f))
            .then(|| ((f * (COLUMNS - 1) as f64).round() as usize).min(COLUMNS - 1))
    }

    fn row(&self, v: f64) -> Option<usize> {
        let f = (v - self.y.0) / (self.y.1 - self.y.0);
        (f.is_finite() && (-1e-9..=1.0 + 1e-9).contains(&f))
            .then(|| ROWS - 1 - ((f * (ROWS - 1) as f64).round() as usize).min(ROWS - 1))
    }

    fn put(&mut self, column: usize, row: usize, c: char) {
        self.cells[row][column] = c;
    }
}

/// Linear interpolation in points ascending in x; `None` outside them.
fn at(points: &[(f64, f64)], t: f64) -> Option<f64> {
    let first = points.first()?;
    let last = points.last()?;
    if t < first.0 - 1e-9 || t > last.0 + 1e-9 {
        return None;
    }
    let k = points.partition_point(|p| p.0 < t);
    if k == 0 {
        return Some(first.1);
    }
    let (a, b) = (points[k - 1], points.get(k).copied().unwrap_or(*last));
    if b.0 <= a.0 {
        return Some(a.1);
    }
    Some(a.1 + (b.1 - a.1) * (t - a.0) / (b.0 - a.0))
}

fn label(x: f64) -> String {
    display(round_significant(x, 3))
}

/// The sketch as lines of text, ending with a newline.
pub fn sketch(spec: &PlotSpec) -> String {
    let (x0, x1) = spec.x_range;
    let x1 = if x1 > x0 { x1 } else { x0 + 1.0 };
    let mut grid = Grid {
        cells: vec![vec![' '; COLUMNS]; ROWS],
        x: (x0, x1),
        y: spec.y_range(),
    };
    let step = (x1 - x0) / (COLUMNS - 1) as f64;
    if let Some(loading) = &spec.loading {
        if let Some(row) = grid.row(loading.value) {
            for column in 0..COLUMNS {
                let t = x0 + step * column as f64;
                if t >= loading.storage.0 - step / 2.0 && t <= loading.storage.1 + step / 2.0 {
                    grid.put(column, row, '=');
                }
            }
        }
    }
    for transition in &spec.transitions {
        if let Some(column) = grid.column(transition.temperature_c) {
            for row in 0..ROWS {
                grid.put(column, row, ':');
            }
        }
    }
    for (index, series) in spec.series.iter().enumerate() {
        for segment in &series.segments {
            let c = if segment.extrapolated {
                '.'
            } else {
                glyph(index)
            };
            let mut previous: Option<usize> = None;
            for column in 0..COLUMNS {
                let t = x0 + step * column as f64;
                let Some(row) = at(&segment.points, t).and_then(|v| grid.row(v)) else {
                    previous = None;
                    continue;
                };
                // Fill the rows between neighbouring columns, so steep curves stay joined.
                let (from, to) = match previous {
                    Some(p) if p.abs_diff(row) > 1 => {
                        if p < row {
                            (p + 1, row)
                        } else {
                            (row, p - 1)
                        }
                    }
                    _ => (row, row),
                };
                for r in from..=to {
                    grid.put(column, r, c);
                }
                previous = Some(row);
            }
        }
    }
    if let Some(loading) = &spec.loading {
        for limiting in &loading.limiting {
            if let (Some(column), Some(row)) = (
                grid.column(limiting.temperature_c),
                grid.row(limiting.value),
            ) {
                grid.put(column, row, 'L');
            }
        }
    }

    let (y0, y1) = grid.y;
    let top = label(y1);
    let bottom = label(y0);
    let width = top.len().max(bottom.len());
    let mut out = format!("  {}\n", spec.title);
    out.push_str(&format!("  {}\n", spec.y_label));
    for (r, cells) in grid.cells.iter().enumerate() {
        let axis = match r {
            0 => format!("{top:>width$}"),
            r if r == ROWS - 1 => format!("{bottom:>width$}"),
            _ => " ".repeat(width),
        };
        let line: String = cells.iter().collect();
        out.push_str(&format!("  {axis} |{}\n", line.trim_end()));
    }
    out.push_str(&format!(
        "  {} +{}\n",
        " ".repeat(width),
        "-".repeat(COLUMNS)
    ));
    let left = label(x0);
    let right = label(x1);
    let gap = COLUMNS.saturating_sub(left.len() + right.len());
    out.push_str(&format!(
        "  {}  {left}{}{right}\n",
        " ".repeat(width),
        " ".repeat(gap),
    ));
    // The axis's label on a line of its own, centred under the axis.
    let label_pad = COLUMNS.saturating_sub(spec.x_label.chars().count()) / 2;
    out.push_str(&format!(
        "  {}  {}{}\n",
        " ".repeat(width),
        " ".repeat(label_pad),
        spec.x_label
    ));
    for (index, series) in spec.series.iter().enumerate() {
        out.push_str(&format!("  {} {}\n", glyph(index), series.label));
    }
    if spec
        .series
        .iter()
        .any(|s| s.segments.iter().any(|g| g.extrapolated))
    {
        out.push_str("  . extrapolated\n");
    }
    for transition in &spec.transitions {
        out.push_str(&format!("  : {}\n", transition.label));
    }
    if let Some(loading) = &spec.loading {
        out.push_str(&format!(
            "  = {} from {} °C to {} °C\n",
            loading.label,
            label(loading.storage.0),
            label(loading.storage.1)
        ));
        for limiting in &loading.limiting {
            out.push_str(&format!("  L {}\n", limiting.label));
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::plot::spec::{Segment, Series};

    #[test]
    fn a_rising_line_climbs_to_the_right() {
        let spec = PlotSpec {
            title: "t".into(),
            x_label: "temperature (°C)".into(),
            y_label: "v".into(),
            x_range: (0.0, 100.0),
            series: vec![Series {
                label: "invented".into(),
                solute: "invented".into(),
                phase: None,
                colour: 0,
                segments: vec![Segment {
                    points: vec![(0.0, 0.0), (100.0, 100.0)],
                    extrapolated: false,
                }],
            }],
            points: Vec::new(),
            transitions: Vec::new(),
            loading: None,
            footnote: String::new(),
        };
        let text = sketch(&spec);
        let lines: Vec<&str> = text.lines().collect();
        // The last grid row holds the low end of the line, at the left.
        let bottom = lines[2 + ROWS - 1];
        assert!(bottom.contains("|*"), "{text}");
        assert!(text.contains("* invented"), "{text}");
        assert!(text.contains("temperature (°C)"), "{text}");
    }
}
