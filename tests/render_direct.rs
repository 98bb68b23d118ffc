//! PNG and PDF are written straight from the scene (src/render/raster.rs,
//! pdf.rs), not from the SVG. The PNG is checked against an independent
//! renderer: resvg drawing the SVG that eyrie writes for the same figure, at
//! the same pixel size, with the bundled font only. Every example profile
//! with the options the gallery uses (annotations, smooth connectors,
//! variants, axis break, double column), and a chart, must come out the same
//! up to anti-aliasing. The PDF's text layer must hold every text of the SVG.

use crate::common::{self, repo};
use resvg::tiny_skia;
use std::path::Path;

/// Resolution of the comparison: fine enough that a glyph misplaced by a
/// tenth of a millimetre shows (0.6 px), coarse enough to keep the test fast.
const DPI: &str = "150";

/// Runs eyrie in `dir` and insists it succeeded.
fn eyrie(args: &[&str], dir: &Path) {
    common::assert_exit(&common::eyrie(args, dir), 0);
}

/// Decoded RGB pixels of a PNG file.
fn decode(bytes: &[u8]) -> (u32, u32, Vec<u8>) {
    let decoder = png::Decoder::new(std::io::Cursor::new(bytes));
    let mut reader = decoder.read_info().expect("a PNG header");
    let mut buf = vec![0; reader.output_buffer_size()];
    let frame = reader.next_frame(&mut buf).expect("the image data");
    assert_eq!(frame.color_type, png::ColorType::Rgb);
    buf.truncate(frame.buffer_size());
    (frame.width, frame.height, buf)
}

/// resvg's drawing of `svg` at `w` × `h` pixels, as RGB on white.
fn resvg_rgb(svg: &str, w: u32, h: u32) -> Vec<u8> {
    let tree = common::usvg_tree(svg);
    let size = tree.size();
    let mut pixmap = tiny_skia::Pixmap::new(w, h).expect("a drawable size");
    pixmap.fill(tiny_skia::Color::WHITE);
    let scale = tiny_skia::Transform::from_scale(w as f32 / size.width(), h as f32 / size.height());
    resvg::render(&tree, scale, &mut pixmap.as_mut());
    pixmap
        .pixels()
        .iter()
        .flat_map(|p| [p.red(), p.green(), p.blue()])
        .collect()
}

/// How two RGB images differ.
#[derive(Debug)]
struct Difference {
    /// Mean absolute difference per channel, over all pixels (0–255).
    mean: f64,
    /// Share of pixels whose largest channel difference exceeds [`NEAR`].
    far_share: f64,
    /// Ink (255 − value, summed over channels) of each image.
    ink: (u64, u64),
}

/// A channel difference up to this is anti-aliasing of the same edge.
const NEAR: u8 = 64;

fn compare(a: &[u8], b: &[u8]) -> Difference {
    assert_eq!(a.len(), b.len());
    let (mut sum, mut far, mut ink_a, mut ink_b) = (0u64, 0usize, 0u64, 0u64);
    for (p, q) in a.chunks_exact(3).zip(b.chunks_exact(3)) {
        let mut worst = 0;
        for (x, y) in p.iter().zip(q) {
            let d = x.abs_diff(*y);
            sum += u64::from(d);
            worst = worst.max(d);
            ink_a += u64::from(255 - x);
            ink_b += u64::from(255 - y);
        }
        far += usize::from(worst > NEAR);
    }
    Difference {
        mean: sum as f64 / a.len() as f64,
        far_share: far as f64 / (a.len() / 3) as f64,
        ink: (ink_a, ink_b),
    }
}

/// Renders `args` (a profile or chart command writing to `{out}`) to SVG and
/// PNG and compares the PNG with resvg's drawing of the SVG.
fn check(name: &str, args: &[&str]) -> Difference {
    let dir = tempfile::tempdir().expect("temp dir");
    let with_output =
        |out: &str| -> Vec<String> { args.iter().map(|a| a.replace("{out}", out)).collect() };
    let svg_args = with_output("f.svg");
    let png_args = with_output("f.png");
    let mut png_args: Vec<&str> = png_args.iter().map(String::as_str).collect();
    png_args.extend(["--dpi", DPI]);
    eyrie(
        &svg_args.iter().map(String::as_str).collect::<Vec<_>>(),
        dir.path(),
    );
    eyrie(&png_args, dir.path());
    let svg = std::fs::read_to_string(dir.path().join("f.svg")).expect("SVG written");
    let (w, h, direct) = decode(&std::fs::read(dir.path().join("f.png")).expect("PNG written"));
    let reference = resvg_rgb(&svg, w, h);
    if let Some(dump) = std::env::var_os("EYRIE_RENDER_DUMP") {
        let mut bytes = Vec::new();
        let mut enc = png::Encoder::new(&mut bytes, w, h);
        enc.set_color(png::ColorType::Rgb);
        enc.set_depth(png::BitDepth::Eight);
        let mut writer = enc.write_header().expect("header");
        writer.write_image_data(&reference).expect("data");
        writer.finish().expect("end");
        let dump = Path::new(&dump);
        std::fs::write(dump.join(format!("{name}-resvg.png")), bytes).expect("dump");
        std::fs::copy(
            dir.path().join("f.png"),
            dump.join(format!("{name}-direct.png")),
        )
        .expect("dump");
    }
    let d = compare(&direct, &reference);
    eprintln!("{name}: {w} × {h} px, {d:?}");
    d
}

#[test]
fn direct_png_matches_resvg_of_the_svg() {
    let mut failures = Vec::new();
    let mut run = |name: &str, args: Vec<String>| {
        let args: Vec<&str> = args.iter().map(String::as_str).collect();
        let d = check(name, &args);
        // Bounds: strokes are drawn by the same rasteriser (tiny-skia) in
        // both; text is not (exact-area glyph coverage against tiny-skia's
        // 4 × 4 supersampling, so edge pixels differ by a few levels and the
        // direct text is up to ~1 % lighter). Measured at 150 dpi: mean
        // 0.22–0.49 per channel, at most 3 pixels (0.0006 %) off by more than
        // 64, ink within 0.6 %. A label set in the wrong face (italic drawn
        // upright: 0.11 % of pixels far off) or text moved 0.1 mm (1–2 %)
        // fails the far-pixel bound, 40× the worst measured (both checked by
        // breaking the renderer); the mean and ink bounds catch wholesale
        // changes (colour, weight, a missing stroke).
        let ink_gap = d.ink.0.abs_diff(d.ink.1) as f64 / d.ink.1.max(1) as f64;
        if d.mean > 0.8 || d.far_share > 2e-4 || ink_gap > 0.015 || d.ink.1 == 0 {
            failures.push(format!("{name}: {d:?}"));
        }
    };
    for (name, extra) in common::gallery_cases() {
        let profile = repo(&format!("profiles/{name}.toml"));
        let mut args = vec!["render".to_string(), profile, "-o".into(), "{out}".into()];
        args.extend(extra);
        run(&name, args);
    }
    // A chart (its own axes, ticks and legend) goes through the same drawing.
    let profile = repo("profiles/entropy-switch.toml");
    run(
        "sweep-chart",
        [
            "sweep", &profile, "--from", "-78 C", "--to", "100 C", "--steps", "41", "--plot",
            "{out}",
        ]
        .iter()
        .map(|s| s.to_string())
        .collect(),
    );
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn pdf_text_is_the_svg_text() {
    // The PDF is written from the scene too; every text of the SVG (the
    // characters of each <text>, styled runs included) must come back out of
    // the PDF's text layer, read by lopdf (whitespace dropped: extraction
    // puts breaks between glyphs).
    let squeeze = |s: &str| -> String { s.chars().filter(|c| !c.is_whitespace()).collect() };
    for (name, extra) in common::gallery_cases() {
        let dir = tempfile::tempdir().expect("temp dir");
        let profile = repo(&format!("profiles/{name}.toml"));
        for out in ["f.svg", "f.pdf"] {
            let mut args = vec!["render", profile.as_str(), "-o", out];
            args.extend(extra.iter().map(String::as_str));
            eyrie(&args, dir.path());
        }
        let svg = std::fs::read_to_string(dir.path().join("f.svg")).expect("SVG written");
        let doc = roxmltree::Document::parse(&svg).expect("SVG parses");
        let pdf = lopdf::Document::load(dir.path().join("f.pdf")).expect("the PDF parses");
        let layer = squeeze(&pdf.extract_text(&[1]).expect("text extracts"));
        let texts: Vec<String> = doc
            .descendants()
            .filter(|n| n.has_tag_name("text"))
            .map(|n| {
                squeeze(
                    &n.descendants()
                        .filter(|d| d.is_text())
                        .filter_map(|d| d.text())
                        .collect::<String>(),
                )
            })
            .filter(|t| !t.is_empty())
            .collect();
        assert!(texts.len() > 10, "{name}: only {} texts", texts.len());
        for t in &texts {
            assert!(
                layer.contains(t.as_str()),
                "{name}: {t:?} not in the PDF's text {layer:?}"
            );
        }
    }
}
