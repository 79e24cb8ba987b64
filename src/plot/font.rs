//! The font of pictures: DejaVu Sans, embedded in the binary (licence in
//! `assets/fonts/LICENSE-DejaVu.txt`), registered with plotters once, so pictures never
//! depend on the fonts of the machine that draws them.

use std::sync::OnceLock;

use plotters::style::{FontStyle, register_font};

use super::error::PlotError;

/// The family name text is drawn with; SVG files name it for their viewers too.
pub const FAMILY: &str = "sans-serif";

/// DejaVu Sans 2.37 (Bitstream Vera licence, redistribution permitted).
static DEJAVU_SANS: &[u8] = include_bytes!("../../assets/fonts/DejaVuSans.ttf");

static REGISTERED: OnceLock<bool> = OnceLock::new();

/// Registers the embedded font with plotters (once per process).
pub fn register() -> Result<(), PlotError> {
    let ok =
        *REGISTERED.get_or_init(|| register_font(FAMILY, FontStyle::Normal, DEJAVU_SANS).is_ok());
    if ok { Ok(()) } else { Err(PlotError::Font) }
}

#[cfg(test)]
mod tests {
    #[test]
    fn embedded_font_registers() {
        assert!(super::register().is_ok());
        assert!(super::register().is_ok());
    }
}
