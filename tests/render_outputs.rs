//! PNG and PDF output and `eyrie watch`, as a user meets them: the PNG has the
//! pixel size asked for, the PDF has the page size in mm and real text in the
//! embedded font, every format is byte-identical across runs, a failed write
//! leaves nothing behind, and the text the layout measured is the text that
//! gets drawn.

use crate::common;
use eyrie::layout::Anchor;
use std::io::Read;
use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};
use std::time::{Duration, Instant};

fn eyrie(args: &[&str], dir: &Path) -> Output {
    Command::new(env!("CARGO_BIN_EXE_eyrie"))
        .args(args)
        .current_dir(dir)
        .output()
        .expect("the binary runs")
}

fn demo() -> String {
    format!("{}/profiles/demo.toml", env!("CARGO_MANIFEST_DIR"))
}

fn scratch() -> tempfile::TempDir {
    tempfile::tempdir().expect("temp dir")
}

fn render(dir: &Path, name: &str, extra: &[&str]) -> Vec<u8> {
    let demo = demo();
    let mut args = vec!["render", demo.as_str(), "-o", name];
    args.extend_from_slice(extra);
    let out = eyrie(&args, dir);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    std::fs::read(dir.join(name)).expect("output written")
}

/// Width, height and pixels per metre of a PNG file.
fn png_info(bytes: &[u8]) -> (u32, u32, Option<u32>) {
    let decoder = png::Decoder::new(std::io::Cursor::new(bytes));
    let mut reader = decoder.read_info().expect("a valid PNG");
    let mut buf = vec![0; reader.output_buffer_size()];
    reader.next_frame(&mut buf).expect("the image decodes");
    let info = reader.info();
    let ppm = info
        .pixel_dims
        .filter(|d| d.unit == png::Unit::Meter)
        .map(|d| d.xppu);
    (info.width, info.height, ppm)
}

#[test]
fn png_has_the_pixel_size_of_width_and_dpi() {
    let dir = scratch();
    // round(mm / 25.4 × dpi) on each side.
    let cases: [(&[&str], u32, u32, u32); 3] = [
        (&[], 2008, 1535, 600), // 85 × 65 mm at 600 dpi
        (
            &["--width", "120", "--height", "80", "--dpi", "300"],
            1417,
            945,
            300,
        ),
        (&["--size", "double", "--dpi", "150"], 1033, 531, 150), // 175 × 90 mm
    ];
    for (extra, w, h, dpi) in cases {
        let bytes = render(dir.path(), "fig.png", extra);
        let (pw, ph, ppm) = png_info(&bytes);
        assert_eq!((pw, ph), (w, h), "{extra:?}");
        // The resolution is stored too (pixels per metre = dpi / 0.0254).
        assert_eq!(ppm, Some((f64::from(dpi) / 0.0254).round() as u32));
    }
}

#[test]
fn pdf_has_the_page_size_in_mm_and_the_labels_as_text() {
    let dir = scratch();
    let bytes = render(dir.path(), "fig.pdf", &["--width", "100", "--height", "70"]);
    let doc = lopdf::Document::load_mem(&bytes).expect("the PDF parses");
    let pages = doc.get_pages();
    assert_eq!(pages.len(), 1);
    let page_id = pages[&1];
    let page = doc.get_dictionary(page_id).unwrap();
    let media: Vec<f64> = page
        .get(b"MediaBox")
        .unwrap()
        .as_array()
        .unwrap()
        .iter()
        .map(|v| v.as_float().map(f64::from).unwrap())
        .collect();
    let mm = |pt: f64| pt / 72.0 * 25.4;
    assert!((mm(media[2] - media[0]) - 100.0).abs() < 0.01, "{media:?}");
    assert!((mm(media[3] - media[1]) - 70.0).abs() < 0.01, "{media:?}");
    // The bundled font is embedded (a TrueType program in a FontFile2 stream).
    let embedded = doc.objects.values().any(|o| {
        o.as_dict()
            .is_ok_and(|d| d.has(b"FontFile2") && d.get(b"FontName").is_ok())
    });
    assert!(embedded, "no embedded font program");
    // Text extraction puts spaces between glyph runs: compare without spaces.
    let text = doc.extract_text(&[1]).expect("text extracts");
    let squeezed: String = text.chars().filter(|c| !c.is_whitespace()).collect();
    for label in [
        "allylether",
        "TS-homolysis",
        "radicalpair",
        "27.3",
        "−15.8",
        "mol⁻¹",
    ] {
        assert!(squeezed.contains(label), "{label} not in {text:?}");
    }
}

#[test]
fn every_format_gives_the_same_bytes_twice() {
    for name in ["fig.svg", "fig.png", "fig.pdf"] {
        let (a, b) = (scratch(), scratch());
        let first = render(a.path(), name, &["--dpi", "150"]);
        let second = render(b.path(), name, &["--dpi", "150"]);
        assert!(first == second, "{name} differs between runs");
    }
}

#[test]
fn an_unwritable_output_exits_3_and_leaves_nothing() {
    let dir = scratch();
    // A path under a regular file cannot be created, even by root.
    std::fs::write(dir.path().join("note.txt"), "x").unwrap();
    for name in ["note.txt/fig.svg", "note.txt/fig.png", "note.txt/fig.pdf"] {
        let out = eyrie(&["render", &demo(), "-o", name], dir.path());
        assert_eq!(out.status.code(), Some(3), "{name}");
        let err = String::from_utf8_lossy(&out.stderr);
        assert!(err.contains("cannot write"), "{err}");
    }
    let left: Vec<_> = std::fs::read_dir(dir.path())
        .unwrap()
        .map(|e| e.unwrap().file_name())
        .collect();
    assert_eq!(left, vec![std::ffi::OsString::from("note.txt")]);
}

#[test]
fn an_unknown_extension_exits_2_naming_the_formats() {
    let dir = scratch();
    let out = eyrie(&["render", &demo(), "-o", "fig.jpg"], dir.path());
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains(".svg, .png or .pdf"), "{err}");
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 0);
    // Too many pixels is a usage error too, found before any drawing.
    let out = eyrie(
        &[
            "render",
            &demo(),
            "-o",
            "a.png",
            "--width",
            "1000",
            "--height",
            "1000",
            "--dpi",
            "4800",
        ],
        dir.path(),
    );
    assert_eq!(out.status.code(), Some(2));
}

#[test]
fn format_option_names_the_default_output() {
    let dir = scratch();
    let out = eyrie(&["render", &demo(), "--format", "pdf"], dir.path());
    assert!(out.status.success());
    let pdf = std::fs::read(dir.path().join("demo.pdf")).unwrap();
    assert!(pdf.starts_with(b"%PDF-"));
}

fn texts_of(group: &resvg::usvg::Group, out: &mut Vec<resvg::usvg::Text>) {
    for node in group.children() {
        match node {
            resvg::usvg::Node::Text(t) => out.push((**t).clone()),
            resvg::usvg::Node::Group(g) => texts_of(g, out),
            _ => {}
        }
    }
}

#[test]
fn drawn_text_stays_inside_the_boxes_the_layout_measured() {
    for name in ["demo", "conformers", "catalytic-cycle"] {
        let path = format!("{}/profiles/{name}.toml", env!("CARGO_MANIFEST_DIR"));
        let text = std::fs::read_to_string(path).unwrap();
        let model = eyrie::profile::parse(&text).unwrap().model;
        let spec = eyrie::figure::diagram_spec(&model, &eyrie::figure::FigureOptions::default());
        let scene = eyrie::layout::layout(&spec, &eyrie::layout::Style::default());
        let tree = common::usvg_tree(&eyrie::render::to_svg(&scene));
        let mut drawn = Vec::new();
        texts_of(tree.root(), &mut drawn);
        let px_per_mm = tree.size().width() / scene.width_mm as f32;
        let page = resvg::tiny_skia::Transform::from_scale(px_per_mm, px_per_mm)
            .invert()
            .unwrap();
        let planned: Vec<_> = scene.texts().collect();
        assert_eq!(drawn.len(), planned.len(), "{name}");
        let mut checked = 0;
        for (d, p) in drawn.iter().zip(planned) {
            let planned_box = p.bbox();
            // Ink (glyph outlines) inside the planned box, to 0.05 mm.
            // The text's own placement in mm (its transform without the
            // page's mm → px scale); glyph outlines are in the text's frame.
            let local = page.pre_concat(d.abs_transform());
            let ink = d.flattened().abs_bounding_box().transform(local).unwrap();
            let tol = 0.05;
            assert!(
                f64::from(ink.left()) >= planned_box.x0 - tol
                    && f64::from(ink.right()) <= planned_box.x1 + tol
                    && f64::from(ink.top()) >= planned_box.y0 - tol
                    && f64::from(ink.bottom()) <= planned_box.y1 + tol,
                "{name}: {:?} drawn at {ink:?}, planned {planned_box:?}",
                p.lines
            );
            // Upright one-line texts set from their right end or centre: the
            // first glyph starts where the measured width says, so the width
            // usvg shapes equals the width the layout measured.
            if p.rotation == 0.0 && p.lines.len() == 1 && p.anchor != Anchor::Start {
                let glyph = &d.layouted()[0].positioned_glyphs[0];
                let start = local.pre_concat(glyph.transform()).tx;
                assert!(
                    (f64::from(start) - planned_box.x0).abs() < 0.01,
                    "{name}: {:?} starts at {start} mm, measured {} mm",
                    p.lines,
                    planned_box.x0
                );
                checked += 1;
            }
        }
        assert!(checked >= 5, "{name}: only {checked} texts checked");
    }
}

/// Kills the watcher when a test ends, passing or not.
struct Running(std::process::Child);

impl Drop for Running {
    fn drop(&mut self) {
        let _ = self.0.kill();
        let _ = self.0.wait();
    }
}

/// Waits up to 20 s for `done` to hold.
fn wait_for(mut done: impl FnMut() -> bool) -> bool {
    let start = Instant::now();
    while start.elapsed() < Duration::from_secs(20) {
        if done() {
            return true;
        }
        std::thread::sleep(Duration::from_millis(50));
    }
    false
}

#[test]
fn watch_redraws_on_save_and_keeps_the_last_good_figure() {
    let dir = scratch();
    let profile: PathBuf = dir.path().join("mech.toml");
    let good = std::fs::read_to_string(demo()).unwrap();
    std::fs::write(&profile, &good).unwrap();
    let out = dir.path().join("fig.svg");
    let child = Command::new(env!("CARGO_BIN_EXE_eyrie"))
        .args(["watch", "mech.toml", "-o", "fig.svg"])
        .current_dir(dir.path())
        .stdin(Stdio::null())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let mut running = Running(child);
    // Collect what it prints while it runs: a line may come a moment after
    // the figure it reports, so the checks below wait for it.
    let stdout = collect(running.0.stdout.take().unwrap());
    let stderr = collect(running.0.stderr.take().unwrap());
    let printed = |log: &std::sync::Arc<std::sync::Mutex<Vec<u8>>>| {
        String::from_utf8_lossy(&log.lock().unwrap()).into_owned()
    };
    assert!(wait_for(|| out.exists()), "first figure not written");
    let first = std::fs::read_to_string(&out).unwrap();
    assert!(first.contains("27.3"));

    // A save that moves TS-concerted from 27.3 to 26.4 redraws the figure.
    let edited = good.replacen("27.3", "26.4", 1);
    assert_ne!(edited, good, "the demo has 27.3");
    std::fs::write(&profile, &edited).unwrap();
    assert!(
        wait_for(|| std::fs::read_to_string(&out).is_ok_and(|s| s.contains("26.4"))),
        "figure not redrawn after the save"
    );
    let second = std::fs::read_to_string(&out).unwrap();

    // A broken save leaves the last good figure; fixing it redraws again.
    std::fs::write(&profile, "[states\nbroken").unwrap();
    std::thread::sleep(Duration::from_millis(1500));
    assert_eq!(std::fs::read_to_string(&out).unwrap(), second);
    std::fs::write(&profile, &good).unwrap();
    assert!(
        wait_for(|| std::fs::read_to_string(&out).is_ok_and(|s| s == first)),
        "figure not redrawn after the fix"
    );

    assert!(
        wait_for(|| printed(&stdout).matches("updated fig.svg").count() >= 3),
        "{}",
        printed(&stdout)
    );
    assert!(
        wait_for(|| printed(&stderr).contains("figure not updated")),
        "{}",
        printed(&stderr)
    );
    let _ = running.0.kill();
    let _ = running.0.wait();
    let (stdout, stderr) = (printed(&stdout), printed(&stderr));
    assert!(stdout.contains("apparent barrier"), "{stdout}");
    assert!(stderr.contains("mech.toml:"), "no located error: {stderr}");
}

/// Reads a child's pipe on a thread into a shared string.
fn collect(mut pipe: impl Read + Send + 'static) -> std::sync::Arc<std::sync::Mutex<Vec<u8>>> {
    let log = std::sync::Arc::new(std::sync::Mutex::new(Vec::new()));
    let sink = log.clone();
    std::thread::spawn(move || {
        let mut buf = [0u8; 4096];
        while let Ok(n) = pipe.read(&mut buf) {
            if n == 0 {
                break;
            }
            sink.lock().unwrap().extend_from_slice(&buf[..n]);
        }
    });
    log
}
