//! PNG output: the scene drawn by tiny-skia at a chosen resolution
//! ([`super::raster`], no SVG text in between).
//!
//! The image is `round(width_mm / 25.4 × dpi)` pixels wide (and likewise
//! high), carries its resolution in a `pHYs` chunk (so word processors and
//! journal systems place it at its printed size), and is encoded with fixed
//! settings and no time stamp, so the same figure always gives the same bytes.
//!
//! Speed (a 600 dpi figure is 3 million pixels): the scene is prepared once
//! ([`Page`]: strokes outlined, text turned into coverage); the page is
//! filled white, so every pixel is opaque and the file is plain RGB; it is
//! drawn in a fixed number of horizontal bands into one reused band-sized
//! pixmap (a sixteenth of the memory to fault in, and each band is encoded
//! while still in cache); each
//! row is filtered with PNG's "up" filter as it is copied out of the pixmap
//! straight into fdeflate's fast compressor (the encoder the png crate itself
//! uses for `Compression::Fast`), without an RGB copy of the image.

use super::RenderError;
use super::raster::Page;
use crate::layout::Scene;

/// Largest image eyrie draws, in pixels (a band of it, about 75 MB, is held
/// in memory while drawing).
pub const MAX_PIXELS: u64 = 300_000_000;

/// How many horizontal bands the page is drawn in, one after the other into
/// the same pixmap. Drawing the next band on a second thread while one is
/// encoded was slower on a busy two-core machine (25.5 → 32.4 ms for the
/// demo at 600 dpi: the encoder waited for a thread that was not running).
/// With the scene prepared once (`Page`), more bands cost little: 16 bands of
/// 0.75 MB (demo at 600 dpi) fault in and clear in a third of the time of 8,
/// and stay in cache while filtered (best of 7 on a busy machine: 8.3 ms
/// total against 12.3 with 8 bands, 11.8 with 4, 16.1 with 32).
const BANDS: u32 = 16;

/// The pixel size of a `width_mm` × `height_mm` figure at `dpi`.
pub fn pixel_size(width_mm: f64, height_mm: f64, dpi: f64) -> (u64, u64) {
    let px = |mm: f64| (mm / 25.4 * dpi).round().max(0.0) as u64;
    (px(width_mm), px(height_mm))
}

/// The scene as a PNG file at `dpi` dots per inch.
pub fn to_png(scene: &Scene, dpi: f64) -> Result<Vec<u8>, RenderError> {
    let (w, h) = pixel_size(scene.width_mm, scene.height_mm, dpi);
    let too_big = || RenderError::Size {
        width_px: w,
        height_px: h,
    };
    if !(dpi.is_finite() && dpi > 0.0) || w == 0 || h == 0 || w * h > MAX_PIXELS {
        return Err(too_big());
    }
    let scale = tiny_skia::Transform::from_scale(
        (w as f64 / scene.width_mm) as f32,
        (h as f64 / scene.height_mm) as f32,
    );
    let page = Page::new(scene, scale);
    let (w, h) = (w as u32, h as u32);
    let band_h = h.div_ceil(BANDS);
    let mut band = tiny_skia::Pixmap::new(w, band_h).ok_or_else(too_big)?;
    let mut rows = Rows::new(w, h)?;
    for first in (0..h).step_by(band_h as usize) {
        draw(&page, &mut band, first);
        rows.write(&band, band_h.min(h - first))?;
    }
    rows.finish(dpi)
}

/// Draws the page into `band` on white, shifted up by `first_row` rows
/// (tiny-skia skips what falls outside the band).
fn draw(page: &Page, band: &mut tiny_skia::Pixmap, first_row: u32) {
    // Opaque white is 255 in every byte, premultiplied or not: a memset.
    band.data_mut().fill(255);
    page.draw(&mut band.as_mut(), first_row);
}

/// The image data being compressed, row by row, as one 8-bit RGB image.
///
/// Every pixel is opaque (drawn over white), so tiny-skia's premultiplied
/// colour is the straight colour and alpha can be dropped.
struct Rows {
    w: u32,
    h: u32,
    compressor: fdeflate::Compressor<Vec<u8>>,
    /// The last row written, RGBA (zeros before the first: "up" then copies it).
    above: Vec<u8>,
    /// One filtered row: the filter type, then RGB.
    filtered: Vec<u8>,
}

impl Rows {
    fn new(w: u32, h: u32) -> Result<Rows, RenderError> {
        let compressor = fdeflate::Compressor::new(Vec::with_capacity(w as usize * h as usize / 8))
            .map_err(RenderError::io)?;
        let mut filtered = vec![0u8; 1 + w as usize * 3];
        filtered[0] = png::FilterType::Up as u8;
        Ok(Rows {
            w,
            h,
            compressor,
            above: vec![0u8; w as usize * 4],
            filtered,
        })
    }

    /// Appends the first `count` rows of `band`.
    fn write(&mut self, band: &tiny_skia::Pixmap, count: u32) -> Result<(), RenderError> {
        let rgba_row = self.w as usize * 4;
        let mut above: &[u8] = &self.above;
        let mut last = None;
        for row in band.data().chunks_exact(rgba_row).take(count as usize) {
            up_filter_rgb(row, above, &mut self.filtered[1..]);
            self.compressor
                .write_data(&self.filtered)
                .map_err(RenderError::io)?;
            above = row;
            last = Some(row);
        }
        if let Some(row) = last {
            self.above.copy_from_slice(row);
        }
        Ok(())
    }

    /// The PNG file: header, resolution, the compressed rows, end.
    fn finish(self, dpi: f64) -> Result<Vec<u8>, RenderError> {
        let zlib = self.compressor.finish().map_err(RenderError::io)?;
        let mut out = Vec::with_capacity(zlib.len() + 256);
        let mut encoder = png::Encoder::new(&mut out, self.w, self.h);
        encoder.set_color(png::ColorType::Rgb);
        encoder.set_depth(png::BitDepth::Eight);
        let per_metre = (dpi / 0.0254).round() as u32;
        encoder.set_pixel_dims(Some(png::PixelDimensions {
            xppu: per_metre,
            yppu: per_metre,
            unit: png::Unit::Meter,
        }));
        let mut writer = encoder.write_header().map_err(RenderError::png)?;
        // A chunk holds at most 2³¹ − 1 bytes.
        for part in zlib.chunks(1 << 30) {
            writer
                .write_chunk(png::chunk::IDAT, part)
                .map_err(RenderError::png)?;
        }
        writer.finish().map_err(RenderError::png)?;
        Ok(out)
    }
}

/// PNG's "up" filter of one opaque RGBA row against the row above, written
/// as RGB. Runs of four pixels equal to the ones above (most of a line
/// drawing) are compared at once and give zeros.
fn up_filter_rgb(row: &[u8], above: &[u8], out: &mut [u8]) {
    let blocks = row
        .chunks_exact(16)
        .zip(above.chunks_exact(16))
        .zip(out.chunks_exact_mut(12));
    let done = blocks.len();
    for ((cur, prev), out) in blocks {
        if cur == prev {
            out.fill(0);
        } else {
            pixels_up(cur, prev, out);
        }
    }
    pixels_up(
        &row[done * 16..],
        &above[done * 16..],
        &mut out[done * 12..],
    );
}

/// The "up" difference of RGBA pixels `cur` over `prev`, as RGB.
fn pixels_up(cur: &[u8], prev: &[u8], out: &mut [u8]) {
    for ((o, c), p) in out
        .chunks_exact_mut(3)
        .zip(cur.chunks_exact(4))
        .zip(prev.chunks_exact(4))
    {
        o[0] = c[0].wrapping_sub(p[0]);
        o[1] = c[1].wrapping_sub(p[1]);
        o[2] = c[2].wrapping_sub(p[2]);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The PNG's pixels as RGB rows, after checking the header.
    fn decode(bytes: &[u8]) -> (u32, u32, Vec<u8>) {
        let decoder = png::Decoder::new(std::io::Cursor::new(bytes));
        let mut reader = decoder.read_info().expect("a PNG header");
        let mut buf = vec![0; reader.output_buffer_size()];
        let frame = reader.next_frame(&mut buf).expect("the image data");
        assert_eq!(frame.color_type, png::ColorType::Rgb);
        assert_eq!(frame.bit_depth, png::BitDepth::Eight);
        buf.truncate(frame.buffer_size());
        (frame.width, frame.height, buf)
    }

    #[test]
    fn bands_decode_to_the_pixels_drawn() {
        // Two bands of a 9 × 3 image (2 rows + 1), with colours in every
        // channel so the "up" filter's differences wrap around; pixels 4–7
        // are the same in every row (the filter's equal-block shortcut) and
        // pixel 8 is the row's remainder after blocks of four.
        let colour = |x: u32, y: u32| {
            [
                (x * 60) as u8,
                (255 - y * 100) as u8,
                (x * y * 37 + 9) as u8,
            ]
        };
        let fill = |pixmap: &mut tiny_skia::Pixmap, first_row: u32| {
            let w = pixmap.width();
            for (i, p) in pixmap.pixels_mut().iter_mut().enumerate() {
                let [r, g, b] = colour(i as u32 % w, first_row + i as u32 / w);
                *p = tiny_skia::PremultipliedColorU8::from_rgba(r, g, b, 255).unwrap();
            }
        };
        let mut a = tiny_skia::Pixmap::new(9, 2).unwrap();
        let mut b = tiny_skia::Pixmap::new(9, 1).unwrap();
        fill(&mut a, 0);
        fill(&mut b, 2);
        let expected: Vec<u8> = (0..3)
            .flat_map(|y| (0..9).flat_map(move |x| colour(x, y)))
            .collect();
        let mut rows = Rows::new(9, 3).unwrap();
        rows.write(&a, 2).unwrap();
        rows.write(&b, 1).unwrap();
        let bytes = rows.finish(300.0).unwrap();
        assert_eq!(decode(&bytes), (9, 3, expected));
    }

    #[test]
    fn banded_drawing_matches_one_pass() {
        // The same page drawn in one pixmap is the reference.
        use crate::layout::{Colour, Curve, Item, Line, Role};
        let scene = Scene {
            width_mm: 30.0,
            height_mm: 20.0,
            title: None,
            font_family: String::new(),
            items: vec![
                Item::Curve(Curve {
                    start: (2.0, 3.0),
                    segments: vec![[(10.0, 25.0), (20.0, -5.0), (28.0, 17.0)]],
                    colour: Colour::hex(0x0072b2),
                    width_pt: 0.4 / crate::layout::text::PT_MM,
                    dash: None,
                    role: Role::Connector,
                    tag: None,
                }),
                Item::Line(Line {
                    points: vec![(3.0, 10.0), (27.0, 10.3)],
                    colour: Colour::hex(0),
                    width_pt: 0.3 / crate::layout::text::PT_MM,
                    dash: None,
                    role: Role::Bar,
                    tag: None,
                }),
            ],
        };
        let (w, h) = pixel_size(30.0, 20.0, 300.0);
        let scale = tiny_skia::Transform::from_scale(w as f32 / 30.0, h as f32 / 20.0);
        let page = Page::new(&scene, scale);
        let mut whole = tiny_skia::Pixmap::new(w as u32, h as u32).unwrap();
        draw(&page, &mut whole, 0);
        let (w32, h32) = (w as u32, h as u32);
        let mut rows = Rows::new(w32, h32).unwrap();
        // Three bands of unequal height, the last one partly used.
        let mut band = tiny_skia::Pixmap::new(w32, h32 / 3 + 1).unwrap();
        for first in [0, h32 / 3 + 1, 2 * (h32 / 3 + 1)] {
            draw(&page, &mut band, first);
            rows.write(&band, (h32 / 3 + 1).min(h32 - first)).unwrap();
        }
        let (dw, dh, rgb) = decode(&rows.finish(300.0).unwrap());
        assert_eq!((u64::from(dw), u64::from(dh)), (w, h));
        // A path that reaches past a band is clipped to it first, which can
        // round its anti-aliased edge a little differently: a few edge pixels
        // differ slightly, nothing is lost or moved.
        let (mut differing, mut inked, mut worst) = (0, 0, 0);
        let (mut ink_whole, mut ink_bands) = (0u64, 0u64);
        for (p, q) in whole.pixels().iter().zip(rgb.chunks_exact(3)) {
            let p = [p.red(), p.green(), p.blue()];
            let d = p.iter().zip(q).map(|(a, b)| a.abs_diff(*b)).max().unwrap();
            worst = worst.max(d);
            differing += usize::from(d > 0);
            inked += usize::from(q.iter().any(|&c| c < 250));
            ink_whole += p.iter().map(|&c| u64::from(255 - c)).sum::<u64>();
            ink_bands += q.iter().map(|&c| u64::from(255 - c)).sum::<u64>();
        }
        // Measured: 230 of 3486 inked pixels, by at most 48 of 255.
        assert!(
            worst <= 64 && differing * 10 < inked,
            "{differing} of {inked} pixels differ, by up to {worst}"
        );
        assert!(
            ink_whole.abs_diff(ink_bands) * 100 < ink_whole,
            "{ink_whole} vs {ink_bands}"
        );
        // Not blank: the curve and the line were drawn.
        assert!(rgb.iter().any(|&c| c < 128));
    }

    #[test]
    fn pixel_size_follows_width_and_dpi() {
        // 85 mm at 600 dpi: 85 / 25.4 × 600 = 2007.87 → 2008 px.
        assert_eq!(pixel_size(85.0, 65.0, 600.0), (2008, 1535));
        // 175 mm at 300 dpi: 2066.93 → 2067 px.
        assert_eq!(pixel_size(175.0, 100.0, 300.0).0, 2067);
        assert_eq!(pixel_size(25.4, 25.4, 72.0), (72, 72));
    }
}
