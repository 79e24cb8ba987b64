//! Pictures written by the front ends: where `--out FILE` (or the session's `save FILE`)
//! puts a plot, in which format (by the file's extension) and at which size. Several plot
//! statements with one `--out curve.svg` write `curve.svg`, `curve-2.svg`, `curve-3.svg`, …
//! in the order of the statements.

use std::path::{Path, PathBuf};

use crate::plot::{self, DEFAULT_SIZE, Format, PlotError, PlotSpec};

/// Why a picture could not be written.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum PictureError {
    /// A bad file name or size: `--out curve.jpg`, `--size 10x10`.
    #[error(transparent)]
    Picture(#[from] PlotError),
    /// A size that is not `WIDTHxHEIGHT`: `--size large`.
    #[error("--size wants WIDTHxHEIGHT in pixels, such as 800x500; found `{0}`")]
    SizeText(String),
    /// The file could not be written: `--out /no/such/dir/curve.svg`.
    #[error("cannot write {path}: {source}")]
    Write {
        path: String,
        #[source]
        source: std::io::Error,
    },
}

/// Where and how plots are written; `out: None` writes nothing.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Pictures {
    pub out: Option<(PathBuf, Format)>,
    pub size: (u32, u32),
}

impl Default for Pictures {
    fn default() -> Self {
        Pictures {
            out: None,
            size: DEFAULT_SIZE,
        }
    }
}

/// `800x500` (or `800×500`) as (width, height).
pub fn parse_size(text: &str) -> Result<(u32, u32), PictureError> {
    let bad = || PictureError::SizeText(text.to_string());
    let (w, h) = text.trim().split_once(['x', 'X', '×']).ok_or_else(bad)?;
    let w: u32 = w.trim().parse().map_err(|_| bad())?;
    let h: u32 = h.trim().parse().map_err(|_| bad())?;
    Ok((w, h))
}

impl Pictures {
    /// Checks the command line's `--out` and `--size` before any statement runs: an unknown
    /// extension or an impossible size is refused at once, naming it.
    pub fn from_args(out: Option<&Path>, size: Option<&str>) -> Result<Pictures, PictureError> {
        let size = match size {
            Some(text) => parse_size(text)?,
            None => DEFAULT_SIZE,
        };
        let (w, h) = size;
        let fits = |s: u32| (plot::render::MIN_SIDE..=plot::render::MAX_SIDE).contains(&s);
        if !fits(w) || !fits(h) {
            return Err(PlotError::BadSize {
                width: w,
                height: h,
            }
            .into());
        }
        let out = match out {
            Some(path) => Some((path.to_path_buf(), Format::from_path(path)?)),
            None => None,
        };
        Ok(Pictures { out, size })
    }

    /// The file of the `n`th plot (from 1): the name given, then `stem-2.ext`, `stem-3.ext`.
    pub fn path_for(&self, n: usize) -> Option<PathBuf> {
        let (path, _) = self.out.as_ref()?;
        if n <= 1 {
            return Some(path.clone());
        }
        let stem = path.file_stem().map(|s| s.to_string_lossy().into_owned());
        let extension = path.extension().map(|s| s.to_string_lossy().into_owned());
        let name = match (stem, extension) {
            (Some(stem), Some(ext)) => format!("{stem}-{n}.{ext}"),
            (Some(stem), None) => format!("{stem}-{n}"),
            _ => format!("plot-{n}"),
        };
        Some(path.with_file_name(name))
    }

    /// Writes the `n`th plot; returns the file written, or `None` when no `--out` was given.
    pub fn write(&self, spec: &PlotSpec, n: usize) -> Result<Option<PathBuf>, PictureError> {
        let (Some((_, format)), Some(path)) = (self.out.as_ref(), self.path_for(n)) else {
            return Ok(None);
        };
        write_picture(spec, &path, *format, self.size)?;
        Ok(Some(path))
    }
}

/// Draws `spec` and writes it to `path` in `format`.
pub fn write_picture(
    spec: &PlotSpec,
    path: &Path,
    format: Format,
    (width, height): (u32, u32),
) -> Result<(), PictureError> {
    let bytes = plot::render(spec, format, width, height)?;
    std::fs::write(path, bytes).map_err(|source| PictureError::Write {
        path: path.display().to_string(),
        source,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn extension_decides_the_format() {
        let p = Pictures::from_args(Some(Path::new("a/curve.SVG")), None).unwrap();
        assert_eq!(p.out.unwrap().1, Format::Svg);
        let p = Pictures::from_args(Some(Path::new("curve.png")), Some("1200x750")).unwrap();
        assert_eq!(p.size, (1200, 750));
        let e = Pictures::from_args(Some(Path::new("curve.jpg")), None).unwrap_err();
        assert_eq!(
            e.to_string(),
            "curve.jpg: satline writes pictures as .svg or .png, not `.jpg`"
        );
        assert!(Pictures::from_args(None, Some("10x10")).is_err());
        assert!(Pictures::from_args(None, Some("big")).is_err());
    }

    #[test]
    fn later_plots_get_numbered_files() {
        let p = Pictures::from_args(Some(Path::new("out/curve.svg")), None).unwrap();
        assert_eq!(p.path_for(1).unwrap(), PathBuf::from("out/curve.svg"));
        assert_eq!(p.path_for(3).unwrap(), PathBuf::from("out/curve-3.svg"));
        assert_eq!(Pictures::default().path_for(1), None);
    }
}
