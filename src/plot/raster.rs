//! A bitmap drawing backend that renders text itself, with the 8×8 bitmap
//! font of the `font8x8` crate (Basic Latin, Latin-1, Greek), so that PNG
//! output needs no system fonts, no fontconfig and no FreeType.

use font8x8::UnicodeFonts;
use plotters::prelude::*;
use plotters_backend::{
    text_anchor::{HPos, VPos},
    BackendColor, BackendCoord, BackendStyle, BackendTextStyle, DrawingErrorKind,
};

/// [`BitMapBackend`] with text drawn from a built-in bitmap font.
pub(crate) struct PngBackend<'a> {
    inner: BitMapBackend<'a>,
}

impl<'a> PngBackend<'a> {
    /// Draws into `buf`, an RGB buffer of `size.0 × size.1` pixels.
    pub(crate) fn new(buf: &'a mut [u8], size: (u32, u32)) -> Self {
        PngBackend {
            inner: BitMapBackend::with_buffer(buf, size),
        }
    }
}

/// Integer magnification of the 8×8 glyphs for a font of `size` pixels.
fn scale(size: f64) -> i32 {
    (((size + 4.0) / 10.0).floor() as i32).max(1)
}

/// Glyph advance in font pixels (the glyphs leave their own right margin).
const ADVANCE: i32 = 8;

/// θ, drawn here: the font's own looks like an `e` at this size.
const THETA: [u8; 8] = [0x1C, 0x36, 0x63, 0x7F, 0x63, 0x36, 0x1C, 0x00];

/// The glyph of `c`, with the few substitutions the plots need.
fn glyph(c: char) -> [u8; 8] {
    if c == 'θ' {
        return THETA;
    }
    if c == '|' {
        // The font's bar is broken (¦).
        return [0x18, 0x18, 0x18, 0x18, 0x18, 0x18, 0x18, 0x00];
    }
    let c = match c {
        '\u{2212}' | '\u{2013}' | '\u{2014}' => '-', // minus sign, dashes
        '\u{2009}' | '\u{202f}' | '\u{00a0}' => ' ',
        '\u{2264}' => '<',
        '\u{2265}' => '>',
        '\u{2208}' => 'e', // ∈
        c => c,
    };
    font8x8::BASIC_FONTS
        .get(c)
        .or_else(|| font8x8::LATIN_FONTS.get(c))
        .or_else(|| font8x8::GREEK_FONTS.get(c))
        .or_else(|| font8x8::MISC_FONTS.get(c))
        .or_else(|| font8x8::BASIC_FONTS.get('?'))
        .unwrap_or([0; 8])
}

impl DrawingBackend for PngBackend<'_> {
    type ErrorType = <BitMapBackend<'static> as DrawingBackend>::ErrorType;

    fn get_size(&self) -> (u32, u32) {
        self.inner.get_size()
    }

    fn ensure_prepared(&mut self) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.ensure_prepared()
    }

    fn present(&mut self) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.present()
    }

    fn draw_pixel(
        &mut self,
        point: BackendCoord,
        color: BackendColor,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.draw_pixel(point, color)
    }

    fn draw_line<S: BackendStyle>(
        &mut self,
        from: BackendCoord,
        to: BackendCoord,
        style: &S,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.draw_line(from, to, style)
    }

    fn draw_rect<S: BackendStyle>(
        &mut self,
        upper_left: BackendCoord,
        bottom_right: BackendCoord,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.draw_rect(upper_left, bottom_right, style, fill)
    }

    fn draw_path<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        path: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.draw_path(path, style)
    }

    fn draw_circle<S: BackendStyle>(
        &mut self,
        center: BackendCoord,
        radius: u32,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.draw_circle(center, radius, style, fill)
    }

    fn fill_polygon<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        vert: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.fill_polygon(vert, style)
    }

    fn blit_bitmap(
        &mut self,
        pos: BackendCoord,
        size: (u32, u32),
        src: &[u8],
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.blit_bitmap(pos, size, src)
    }

    fn estimate_text_size<TStyle: BackendTextStyle>(
        &self,
        text: &str,
        style: &TStyle,
    ) -> Result<(u32, u32), DrawingErrorKind<Self::ErrorType>> {
        let s = scale(style.size());
        let n = text.chars().count() as i32;
        Ok(((n * ADVANCE * s) as u32, (8 * s) as u32))
    }

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
        let s = scale(style.size());
        let n = text.chars().count() as i32;
        let (width, height) = (n * ADVANCE * s, 8 * s);
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
        let trans = style.transform();
        let (w, h) = self.get_size();
        for (k, c) in text.chars().enumerate() {
            let g = glyph(c);
            let x0 = k as i32 * ADVANCE * s;
            for (row, bits) in g.iter().enumerate() {
                for col in 0..8 {
                    if bits & (1 << col) == 0 {
                        continue;
                    }
                    for a in 0..s {
                        for b in 0..s {
                            let (x, y) =
                                trans.transform(x0 + col * s + a + dx, row as i32 * s + b + dy);
                            let (x, y) = (pos.0 + x, pos.1 + y);
                            if x >= 0 && y >= 0 && x < w as i32 && y < h as i32 {
                                self.inner.draw_pixel((x, y), color)?;
                            }
                        }
                    }
                }
            }
        }
        Ok(())
    }
}
