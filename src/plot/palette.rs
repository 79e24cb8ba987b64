//! The colours and marker shapes of pictures, chosen so that readers with any common form
//! of colour-blindness can tell the series apart.
//!
//! Colours: the palette of M. Okabe and K. Ito, "Color Universal Design (CUD): how to make
//! figures and presentations that are friendly to colorblind people" (J*FLY, 2002, revised
//! 2008), as reproduced by B. Wong, "Points of view: Color blindness", Nature Methods 8, 441
//! (2011). Hex values as those publications give them (typed from memory of them). The
//! order puts the colours with the most contrast on white first; yellow, faint on white,
//! comes last. Shapes carry the source of tabulated points, so colour is never the only cue.

/// Okabe–Ito colours as (red, green, blue), in the order series receive them.
pub const OKABE_ITO: [(u8, u8, u8); 8] = [
    (0x00, 0x72, 0xB2), // blue
    (0xD5, 0x5E, 0x00), // vermillion
    (0x00, 0x9E, 0x73), // bluish green
    (0xCC, 0x79, 0xA7), // reddish purple
    (0xE6, 0x9F, 0x00), // orange
    (0x56, 0xB4, 0xE9), // sky blue
    (0x00, 0x00, 0x00), // black
    (0xF0, 0xE4, 0x42), // yellow
];

/// The colour of series `index` (the palette repeats after eight).
pub fn colour(index: usize) -> (u8, u8, u8) {
    OKABE_ITO[index % OKABE_ITO.len()]
}

/// The colour as `#rrggbb`, as SVG writes it.
pub fn hex(index: usize) -> String {
    let (r, g, b) = colour(index);
    format!("#{r:02X}{g:02X}{b:02X}")
}

/// Marker shapes for the sources of tabulated points, in order.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Shape {
    Circle,
    Triangle,
    Square,
    Cross,
}

/// The shape of source `index` (the shapes repeat after four).
pub fn shape(index: usize) -> Shape {
    [Shape::Circle, Shape::Triangle, Shape::Square, Shape::Cross][index % 4]
}

/// The character of series `index` in the terminal sketch.
pub fn glyph(index: usize) -> char {
    ['*', 'o', '+', 'x', '#', '@', '%', '&'][index % 8]
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn colours_repeat_and_print_as_hex() {
        assert_eq!(hex(0), "#0072B2");
        assert_eq!(colour(8), colour(0));
        assert_eq!(shape(5), Shape::Triangle);
    }
}
