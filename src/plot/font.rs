//! The font of pictures: DejaVu Sans, embedded in the binary (licence in
//! `assets/fonts/LICENSE-DejaVu.txt`), registered with plotters once, so pictures never
//! depend on the fonts of the machine that draws them.

use std::sync::OnceLock;

use plotters::style::{FontStyle, register_font};

use super::error::PlotError;

/// The family name text is drawn with. SVG files name it too, and carry the font itself
/// (`embed_in_svg`), so their text looks the same wherever they are opened.
pub const FAMILY: &str = "DejaVu Sans";

/// DejaVu Sans 2.37 (Bitstream Vera licence, redistribution permitted).
pub(super) static DEJAVU_SANS: &[u8] = include_bytes!("../../assets/fonts/DejaVuSans.ttf");

static REGISTERED: OnceLock<bool> = OnceLock::new();

/// Registers the embedded font with plotters (once per process).
pub fn register() -> Result<(), PlotError> {
    let ok =
        *REGISTERED.get_or_init(|| register_font(FAMILY, FontStyle::Normal, DEJAVU_SANS).is_ok());
    if ok { Ok(()) } else { Err(PlotError::Font) }
}

/// The SVG with the font embedded: a `@font-face` rule whose source is the font file itself
/// (base64 in a `data:` URL), placed first inside the `<svg>` element, so a viewer draws
/// the text with the font the PNG uses, whether or not the machine has it installed.
pub fn embed_in_svg(svg: &str) -> String {
    let Some(open_end) = svg
        .find("<svg")
        .and_then(|at| svg[at..].find('>').map(|e| at + e + 1))
    else {
        return svg.to_string();
    };
    let mut out = String::with_capacity(svg.len() + DEJAVU_SANS.len() * 4 / 3 + 200);
    out.push_str(&svg[..open_end]);
    out.push_str("\n<defs><style>@font-face{font-family:'");
    out.push_str(FAMILY);
    out.push_str("';src:url(data:font/ttf;base64,");
    base64(DEJAVU_SANS, &mut out);
    out.push_str(") format('truetype');}</style></defs>");
    out.push_str(&svg[open_end..]);
    out
}

/// Standard base64 (RFC 4648, with padding) of `bytes`, appended to `out`.
fn base64(bytes: &[u8], out: &mut String) {
    const ALPHABET: &[u8; 64] = b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
    for chunk in bytes.chunks(3) {
        let b = [
            chunk[0],
            chunk.get(1).copied().unwrap_or(0),
            chunk.get(2).copied().unwrap_or(0),
        ];
        let n = (u32::from(b[0]) << 16) | (u32::from(b[1]) << 8) | u32::from(b[2]);
        let letters = [(n >> 18) & 63, (n >> 12) & 63, (n >> 6) & 63, n & 63];
        for (i, letter) in letters.iter().enumerate() {
            if i <= chunk.len() {
                out.push(char::from(ALPHABET[*letter as usize]));
            } else {
                out.push('=');
            }
        }
    }
}

#[cfg(test)]
mod tests {
    #[test]
    fn base64_of_known_texts() {
        let mut out = String::new();
        super::base64(b"Man", &mut out);
        assert_eq!(out, "TWFu");
        out.clear();
        super::base64(b"Ma", &mut out);
        assert_eq!(out, "TWE=");
        out.clear();
        super::base64(b"M", &mut out);
        assert_eq!(out, "TQ==");
    }

    #[test]
    fn the_font_goes_first_inside_the_svg() {
        let svg = super::embed_in_svg(
            "<svg width=\"8\">\n<text font-family=\"DejaVu Sans\">a</text></svg>",
        );
        assert!(
            svg.starts_with("<svg width=\"8\">\n<defs><style>@font-face{font-family:'DejaVu Sans'")
        );
        assert!(svg.ends_with("<text font-family=\"DejaVu Sans\">a</text></svg>"));
    }

    #[test]
    fn embedded_font_registers() {
        assert!(super::register().is_ok());
        assert!(super::register().is_ok());
    }
}
