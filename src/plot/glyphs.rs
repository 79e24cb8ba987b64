//! Text in PNG pictures, set glyph by glyph at its exact place. plotters' own text drawing
//! puts each glyph's raster at the pen position rounded down, without the glyph's side
//! bearing, so letters drift apart or together ("NaC l") and more so in large pictures.
//! [`TrueText`] wraps a backend and draws text itself with ab_glyph, each glyph outlined at
//! its sub-pixel position (pen plus kerning); everything else goes to the wrapped backend.

use ab_glyph::{Font, FontRef, ScaleFont, point};
use plotters::prelude::*;
use plotters_backend::{
    BackendColor, BackendCoord, BackendStyle, BackendTextStyle, DrawingErrorKind,
    text_anchor::{HPos, VPos},
};

use super::font::DEJAVU_SANS;

/// A backend whose text is set by [`TrueText::draw_text`].
pub struct TrueText<DB>(pub DB);

impl<DB: DrawingBackend> DrawingBackend for TrueText<DB> {
    type ErrorType = DB::ErrorType;

    fn get_size(&self) -> (u32, u32) {
        self.0.get_size()
    }

    fn ensure_prepared(&mut self) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.ensure_prepared()
    }

    fn present(&mut self) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.present()
    }

    fn draw_pixel(
        &mut self,
        point: BackendCoord,
        color: BackendColor,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.draw_pixel(point, color)
    }

    fn draw_line<S: BackendStyle>(
        &mut self,
        from: BackendCoord,
        to: BackendCoord,
        style: &S,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.draw_line(from, to, style)
    }

    fn draw_rect<S: BackendStyle>(
        &mut self,
        upper_left: BackendCoord,
        bottom_right: BackendCoord,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.draw_rect(upper_left, bottom_right, style, fill)
    }

    fn draw_path<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        path: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.draw_path(path, style)
    }

    fn draw_circle<S: BackendStyle>(
        &mut self,
        center: BackendCoord,
        radius: u32,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.draw_circle(center, radius, style, fill)
    }

    fn fill_polygon<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        vert: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.fill_polygon(vert, style)
    }

    fn blit_bitmap(
        &mut self,
        pos: BackendCoord,
        (iw, ih): (u32, u32),
        src: &[u8],
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.blit_bitmap(pos, (iw, ih), src)
    }

    /// Sets `text` with the embedded font: anchored and turned as the style says (as
    /// plotters does), each glyph outlined at its exact pen position, its coverage blended
    /// into the wrapped backend's pixels.
    fn draw_text<TStyle: BackendTextStyle>(
        &mut self,
        text: &str,
        style: &TStyle,
        pos: BackendCoord,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        let color = style.color();
        if color.alpha == 0.0 {
            return Ok(());
        }
        let Ok(font) = FontRef::try_from_slice(DEJAVU_SANS) else {
            return self.0.draw_text(text, style, pos);
        };
        let ((min_x, min_y), (max_x, max_y)) = style
            .layout_box(text)
            .map_err(|e| DrawingErrorKind::FontError(Box::new(e)))?;
        let (width, height) = (max_x - min_x, max_y - min_y);
        let dx = match style.anchor().h_pos {
            HPos::Left => 0,
            HPos::Right => -width,
            HPos::Center => -width / 2,
        };
        let dy = match style.anchor().v_pos {
            VPos::Top => 0,
            VPos::Center => -height / 2,
            VPos::Bottom => -height,
        };
        let turn = style.transform();
        let (w, h) = self.get_size();
        let size = style.size() as f32;
        let scaled = font.as_scaled(size);
        let mut pen = 0f32;
        let mut previous = None;
        for c in text.chars() {
            let id = scaled.glyph_id(c);
            if let Some(p) = previous {
                pen += scaled.kern(p, id);
            }
            previous = Some(id);
            // The baseline half the size below the top, where plotters puts it, so text
            // stands where its layout box says.
            let glyph = id.with_scale_and_position(size, point(pen, size / 2.0));
            if let Some(outline) = scaled.outline_glyph(glyph) {
                let bounds = outline.px_bounds();
                let (left, top) = (bounds.min.x as i32, bounds.min.y as i32);
                let mut covered = Vec::new();
                outline.draw(|x, y, coverage| {
                    covered.push((left + x as i32, top + y as i32, coverage));
                });
                for (x, y, coverage) in covered {
                    let (x, y) = turn.transform(x + dx - min_x, y + dy - min_y);
                    let (x, y) = (pos.0 + x, pos.1 + y);
                    if x >= 0 && x < w as i32 && y >= 0 && y < h as i32 && coverage > 0.0 {
                        let blended = BackendColor {
                            alpha: color.alpha * f64::from(coverage.min(1.0)),
                            rgb: color.rgb,
                        };
                        self.0.draw_pixel((x, y), blended)?;
                    }
                }
            }
            pen += scaled.h_advance(id);
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The runs of blank columns between the inked columns of `text` set at `size` pixels.
    fn gaps(text: &str, size: u32) -> Vec<usize> {
        let (w, h) = (60 * size, 2 * size);
        let mut pixels = vec![255u8; (w * h * 3) as usize];
        {
            let backend = BitMapBackend::with_buffer(&mut pixels, (w, h));
            let root = TrueText(backend).into_drawing_area();
            super::super::font::register().unwrap();
            let style = TextStyle::from((super::super::font::FAMILY, size).into_font());
            root.draw(&Text::new(text.to_string(), (4, 4), style))
                .unwrap();
            root.present().unwrap();
        }
        let inked: Vec<bool> = (0..w as usize)
            .map(|x| (0..h as usize).any(|y| pixels[(y * w as usize + x) * 3] < 128))
            .collect();
        let first = inked.iter().position(|i| *i).unwrap();
        let last = inked.iter().rposition(|i| *i).unwrap();
        let mut runs = Vec::new();
        let mut run = 0;
        for i in &inked[first..=last] {
            if *i {
                if run > 0 {
                    runs.push(run);
                }
                run = 0;
            } else {
                run += 1;
            }
        }
        runs
    }

    #[test]
    fn letters_keep_their_spacing_in_large_text() {
        // "NaCl" at 48 px: the gap before `l` is like the others, not a word space.
        let runs = gaps("NaCl", 48);
        assert_eq!(runs.len(), 3, "{runs:?}");
        let widest = *runs.iter().max().unwrap();
        assert!(
            widest <= 8,
            "a gap of {widest} px between letters: {runs:?}"
        );
    }
}
