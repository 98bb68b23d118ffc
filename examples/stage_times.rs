//! Time per stage of drawing one figure, in process (no start-up, no file
//! writes): parse, analyze, figure spec, layout (also as the first layout of
//! a process, before text widths are remembered), SVG, the PNG as eyrie makes
//! it (drawn straight from the scene in bands, each encoded as it is done),
//! and for reference the older route of the SVG read back into a usvg tree
//! and drawn by resvg into one pixmap; PDF as one stage.
//! The benchmark `benches/render.sh` runs it; whole-process times are there.
//!
//!     cargo run --release --example stage_times -- profiles/demo.toml 600 200
//!
//! Arguments: profile (default profiles/demo.toml), PNG dpi (600), iterations
//! (200). Prints the median µs per stage. The first font load (a one-time
//! cost per process) is printed on its own.

use eyrie::figure::{FigureOptions, diagram_spec};
use resvg::{tiny_skia, usvg};
use std::hint::black_box;
use std::sync::Arc;
use std::time::Instant;

/// Median of `runs` timings of `f`, µs.
fn median_us<T>(runs: usize, mut f: impl FnMut() -> T) -> f64 {
    let mut t: Vec<f64> = (0..runs)
        .map(|_| {
            let start = Instant::now();
            black_box(f());
            start.elapsed().as_secs_f64() * 1e6
        })
        .collect();
    t.sort_by(f64::total_cmp);
    t[t.len() / 2]
}

/// The bundled faces only, as the renderer loads them.
fn fonts() -> Arc<usvg::fontdb::Database> {
    let mut db = usvg::fontdb::Database::new();
    for face in [eyrie::font::REGULAR, eyrie::font::ITALIC] {
        db.load_font_source(usvg::fontdb::Source::Binary(Arc::new(face)));
    }
    db.set_sans_serif_family(eyrie::font::FAMILY);
    Arc::new(db)
}

fn main() {
    let mut args = std::env::args().skip(1);
    let path = args.next().unwrap_or_else(|| "profiles/demo.toml".into());
    let dpi: f64 = args.next().and_then(|a| a.parse().ok()).unwrap_or(600.0);
    let runs: usize = args
        .next()
        .and_then(|a| a.parse().ok())
        .unwrap_or(200)
        .max(1);
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| {
        eprintln!("cannot read {path}: {e}");
        std::process::exit(2)
    });
    let Ok(parsed) = eyrie::profile::parse(&text) else {
        eprintln!("{path} does not parse; run `eyrie analyze {path}` for the errors");
        std::process::exit(2)
    };
    let model = parsed.model;
    let options = FigureOptions::default();
    let style = options.style().expect("the default preset exists");
    let spec = diagram_spec(&model, &options);
    let scene = eyrie::layout::layout(&spec, &style);
    let svg = eyrie::render::to_svg(&scene);

    let start = Instant::now();
    let db = fonts();
    let font_load = start.elapsed().as_secs_f64() * 1e6;
    let usvg_options = usvg::Options {
        font_family: eyrie::font::FAMILY.to_string(),
        fontdb: db,
        ..usvg::Options::default()
    };
    let tree = usvg::Tree::from_str(&svg, &usvg_options).expect("eyrie's SVG reads back");
    let (w, h) = eyrie::render::pixel_size(scene.width_mm, scene.height_mm, dpi);
    let raster = || {
        let mut pixmap = tiny_skia::Pixmap::new(w as u32, h as u32).expect("a drawable size");
        let size = tree.size();
        let transform =
            tiny_skia::Transform::from_scale(w as f32 / size.width(), h as f32 / size.height());
        resvg::render(&tree, transform, &mut pixmap.as_mut());
        pixmap
    };
    // Shape and read the glyphs once (per-thread caches), as a process's
    // first figure does; the fresh-thread row below shows that first time.
    let _ = eyrie::render::to_png(&scene, 10.0);

    let rows = [
        (
            "parse",
            median_us(runs, || eyrie::profile::parse(&text).is_ok()),
        ),
        (
            "analyze",
            median_us(runs, || eyrie::kinetics::analyze(&model)),
        ),
        (
            "figure spec",
            median_us(runs, || diagram_spec(&model, &options)),
        ),
        (
            "layout",
            median_us(runs, || eyrie::layout::layout(&spec, &style)),
        ),
        // A process lays out once, before any text width is remembered: each
        // run in a new thread (whose memory of widths is empty).
        (
            "layout, first in a process",
            median_us(runs, || {
                std::thread::scope(|s| s.spawn(|| eyrie::layout::layout(&spec, &style)).join())
            }),
        ),
        ("SVG", median_us(runs, || eyrie::render::to_svg(&scene))),
        (
            "PNG total (draw bands + encode)",
            median_us(runs.min(50), || eyrie::render::to_png(&scene, dpi).is_ok()),
        ),
        (
            "PNG, first in a process",
            median_us(runs.min(50), || {
                std::thread::scope(|s| {
                    s.spawn(|| eyrie::render::to_png(&scene, dpi).is_ok())
                        .join()
                })
            }),
        ),
        (
            "ref: SVG → tree (usvg)",
            median_us(runs, || usvg::Tree::from_str(&svg, &usvg_options).is_ok()),
        ),
        (
            "ref: resvg raster, one pixmap",
            median_us(runs.min(50), raster),
        ),
        (
            "PDF total",
            median_us(runs, || eyrie::render::to_pdf(&scene).is_ok()),
        ),
    ];
    println!(
        "{path}: median of {runs} runs (raster and PNG: {}), {dpi} dpi = {w} × {h} px",
        runs.min(50)
    );
    println!(
        "{:<36} {:>10.0} µs (once per process)",
        "font database (reference route)", font_load
    );
    for (name, us) in &rows {
        println!("{name:<36} {us:>10.0} µs");
    }
}
