//! What a picture of curves shows, as plain data: series of sampled points (solid where the
//! data reach, dashed where extrapolated), tabulated points marked by source, transition
//! temperatures, and the loading line of a screening question. The engine builds it from
//! the catalog and an answer carries it; `plot::render` and `plot::sketch` draw it and
//! compute nothing (`plot::spec` is this module).

use serde::Serialize;

/// One stretch of a series, drawn as one line.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Segment {
    /// (temperature °C, value in the plot's unit), ascending in temperature.
    pub points: Vec<(f64, f64)>,
    /// Outside the data (or bridging a gap between two solid phases): drawn dashed.
    pub extrapolated: bool,
}

/// One line of the picture: one solute, and for a solid one solid phase (branch).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Series {
    /// The legend entry, e.g. `sodium sulfate, solid Na2SO4·10H2O`.
    pub label: String,
    /// The solute's name.
    pub solute: String,
    /// The solid phase in equilibrium on this branch (none for a gas).
    pub phase: Option<String>,
    /// Index into the palette.
    pub colour: usize,
    pub segments: Vec<Segment>,
}

/// Tabulated points of one solute from one source.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PointSet {
    /// The legend entry for the source, e.g. `data: perry-7-solubility`.
    pub source: String,
    /// Index into the palette (the colour of the series the points belong to).
    pub colour: usize,
    /// Index into the marker shapes: one shape per source across the picture.
    pub shape: usize,
    /// (temperature °C, value in the plot's unit).
    pub points: Vec<(f64, f64)>,
}

/// A temperature where the stable solid changes.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TransitionMark {
    pub temperature_c: f64,
    /// E.g. `Na2SO4·10H2O → Na2SO4, 32.4 C`.
    pub label: String,
    pub colour: usize,
}

/// The point of a curve that limits a loading over the storage range.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Limiting {
    pub temperature_c: f64,
    pub value: f64,
    pub colour: usize,
    /// E.g. `KCl limits at 2 C: headroom 12.5%`.
    pub label: String,
    pub holds: bool,
}

/// The loading of a screening question: a horizontal line over the storage range.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LoadingLine {
    /// E.g. `loading 30 g/100g water`.
    pub label: String,
    /// The loading in the plot's unit.
    pub value: f64,
    /// The loading raised by the margin asked for, when there is one (dotted line).
    pub with_margin: Option<f64>,
    /// What the dotted line is, with its value: `loading raised by the 10% margin: 33 g/100g
    /// water`.
    pub margin_label: Option<String>,
    /// The storage range, °C.
    pub storage: (f64, f64),
    pub limiting: Vec<Limiting>,
}

/// Everything a picture shows.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PlotSpec {
    pub title: String,
    /// E.g. `temperature (°C)`.
    pub x_label: String,
    /// E.g. `solubility (g/100g water, anhydrous)`.
    pub y_label: String,
    /// The temperature range drawn, °C.
    pub x_range: (f64, f64),
    pub series: Vec<Series>,
    pub points: Vec<PointSet>,
    pub transitions: Vec<TransitionMark>,
    pub loading: Option<LoadingLine>,
    /// Lines under the picture, separated by `\n`: what dashes mean, the caution, the
    /// sources as short citations, and whether the data are typed from memory or unreviewed.
    pub footnote: String,
}

impl PlotSpec {
    /// The value range the picture must show: every series, point and loading, from zero.
    pub fn y_range(&self) -> (f64, f64) {
        let mut high = f64::NEG_INFINITY;
        let mut low: f64 = 0.0;
        let mut see = |v: f64| {
            if v.is_finite() {
                high = high.max(v);
                low = low.min(v);
            }
        };
        for series in &self.series {
            for segment in &series.segments {
                segment.points.iter().for_each(|p| see(p.1));
            }
        }
        for set in &self.points {
            set.points.iter().for_each(|p| see(p.1));
        }
        if let Some(loading) = &self.loading {
            see(loading.value);
            if let Some(v) = loading.with_margin {
                see(v);
            }
        }
        if !high.is_finite() || high <= low {
            high = low + 1.0;
        }
        // Room above the highest value for the legend to sit clear of the lines.
        (low, high * 1.08)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn value_range_starts_at_zero_and_leaves_room() {
        let spec = PlotSpec {
            title: String::new(),
            x_label: String::new(),
            y_label: String::new(),
            x_range: (0.0, 10.0),
            series: vec![Series {
                label: "a".into(),
                solute: "a".into(),
                phase: None,
                colour: 0,
                segments: vec![Segment {
                    points: vec![(0.0, 5.0), (10.0, 50.0)],
                    extrapolated: false,
                }],
            }],
            points: Vec::new(),
            transitions: Vec::new(),
            loading: None,
            footnote: String::new(),
        };
        let (low, high) = spec.y_range();
        assert_eq!(low, 0.0);
        assert!(high > 50.0);
    }
}
