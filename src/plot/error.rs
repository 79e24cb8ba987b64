//! Why a picture could not be drawn or written.

/// A picture that could not be made.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[non_exhaustive]
pub enum PlotError {
    /// A file name whose extension is not a picture format satline writes:
    /// `satline "plot KNO3 from 0 C to 100 C" --out curve.jpg`.
    #[error("{path}: satline writes pictures as .svg or .png, not {}", if extension.is_empty() { "a file without an extension".to_string() } else { format!("`{extension}`") })]
    UnknownExtension { path: String, extension: String },
    /// A picture too small to read or too large to draw: `--size 10x10`.
    #[error(
        "a picture of {width}×{height} pixels cannot be drawn: each side must be from 200 to 4000 pixels"
    )]
    BadSize { width: u32, height: u32 },
    /// The embedded font could not be read (a corrupt build); no input triggers it.
    #[error("the embedded font could not be loaded")]
    Font,
    /// The drawing library failed; no known input triggers it.
    #[error("the picture could not be drawn: {0}")]
    Draw(String),
    /// The PNG encoder failed; no known input triggers it.
    #[error("the PNG could not be encoded: {0}")]
    Encode(String),
}
