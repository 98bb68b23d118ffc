//! Every example profile in `profiles/` through figure → layout → SVG, plain
//! and fully annotated: no two texts (labels, values, annotations, legend,
//! ticks) intersect, every text stays on the page, smooth connectors keep
//! horizontal ends without overshoot, and the SVG matches its snapshot.
//!
//! Snapshots live in `tests/snapshots/<profile>.svg` (annotated settings).
//! After a deliberate change to layout, rendering or text measurement run
//! `EYRIE_BLESS=1 cargo test --test layout_profiles` and review the diff.
//! `EYRIE_RENDER_DUMP=dir` also writes every SVG into `dir` for viewing.

use eyrie::figure::{FigureOptions, diagram_spec};
use eyrie::layout::{Connector, Role, Scene, layout};
use eyrie::model::Model;
use eyrie::render::to_svg;
use std::path::Path;

fn profiles() -> Vec<(String, Model)> {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let mut files: Vec<_> = std::fs::read_dir(root.join("profiles"))
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|e| e == "toml"))
        .collect();
    files.sort();
    files
        .into_iter()
        .map(|p| {
            let name = p.file_stem().unwrap().to_string_lossy().into_owned();
            let text = std::fs::read_to_string(&p).unwrap();
            let parsed = eyrie::profile::parse(&text)
                .unwrap_or_else(|e| panic!("{name} does not parse: {e:?}"));
            let mut model = parsed.model;
            // Absolute hartree energies read best in kcal/mol (as in the gallery).
            if name == "hartree-absolute" {
                model = model.with_unit(eyrie::units::EnergyUnit::KcalPerMol);
            }
            (name, model)
        })
        .collect()
}

fn settings() -> Vec<(&'static str, FigureOptions)> {
    vec![
        ("plain", FigureOptions::default()),
        ("annotated", FigureOptions::annotated()),
        (
            "slide",
            FigureOptions {
                preset: "slide".into(),
                ..FigureOptions::annotated()
            },
        ),
    ]
}

/// More than 16 stationary points make a double-column figure: at 85 mm such
/// a profile leaves no room for its labels (see docs/figures.md).
fn scene(model: &Model, options: &FigureOptions) -> Scene {
    let mut options = options.clone();
    if model.points().len() > 16 && options.preset == "article" {
        options.preset = "article-wide".into();
    }
    layout(&diagram_spec(model, &options), &options.style().unwrap())
}

#[test]
fn no_text_overlaps_or_leaves_the_page_in_any_profile() {
    let mut problems = Vec::new();
    for (name, model) in profiles() {
        for (setting, options) in settings() {
            // Known gap: 25 states do not yet fit the slide preset's large type.
            if setting == "slide" && model.points().len() > 16 {
                continue;
            }
            let scene = scene(&model, &options);
            let texts: Vec<_> = scene.texts().collect();
            if let Some(&(i, j)) = scene.overlapping_texts().first() {
                problems.push(format!(
                    "{name}/{setting}: {:?} overlaps {:?}",
                    texts[i].plain_lines(),
                    texts[j].plain_lines()
                ));
            }
            for t in &texts {
                let b = t.bbox();
                if !(b.x0 >= 0.0
                    && b.y0 >= 0.0
                    && b.x1 <= scene.width_mm
                    && b.y1 <= scene.height_mm)
                {
                    problems.push(format!(
                        "{name}/{setting}: {:?} leaves the page: {b:?}",
                        t.plain_lines()
                    ));
                }
            }
            if let Ok(dir) = std::env::var("EYRIE_RENDER_DUMP") {
                std::fs::write(format!("{dir}/{name}-{setting}.svg"), to_svg(&scene)).unwrap();
            }
        }
    }
    assert!(problems.is_empty(), "{problems:#?}");
}

#[test]
fn annotations_appear_where_the_analysis_has_them() {
    let all = profiles();
    let get = |n: &str| &all.iter().find(|(name, _)| name == n).unwrap().1;
    let annotated = FigureOptions::annotated();
    let texts = |n: &str| -> Vec<String> {
        scene(get(n), &annotated)
            .texts()
            .filter(|t| t.role == Role::AnnotationText)
            .map(|t| t.plain_lines().join(" / "))
            .collect()
    };
    // The demo: the apparent barrier of the concerted path is 27.3 − 0.0
    // (profile energies), shown as a ΔG‡ arrow.
    assert!(
        texts("demo").iter().any(|t| t == "ΔG‡ = 27.3"),
        "{:?}",
        texts("demo")
    );
    // Conformers: ΔΔG‡ = 18.1 − 16.9 = 1.2 between the two epoxidation TSs
    // (profile energies).
    let c = texts("curtin-hammett");
    assert!(c.iter().any(|t| t.starts_with("ΔΔG‡ = 1.2 / ")), "{c:?}");
    // A cycle shows its energetic span instead of a barrier arrow.
    let cyc = texts("hydrogenation-cycle");
    assert!(cyc.iter().any(|t| t.starts_with("δE = ")), "{cyc:?}");
    assert!(cyc.iter().any(|t| t.contains("TOF = ")), "{cyc:?}");
    // The rate-determining states of the slowest path are highlighted.
    let s = scene(get("demo"), &annotated);
    assert_eq!(s.lines().filter(|l| l.role == Role::Highlight).count(), 2);
    // Nothing is added without asking.
    let plain = scene(get("demo"), &FigureOptions::default());
    assert!(!plain.texts().any(|t| t.role == Role::AnnotationText));
    assert!(
        !plain
            .lines()
            .any(|l| matches!(l.role, Role::Annotation | Role::Highlight))
    );
}

#[test]
fn smooth_connectors_are_horizontal_at_bars_and_never_overshoot() {
    for (name, model) in profiles() {
        let options = FigureOptions {
            connector: Connector::Smooth,
            ..FigureOptions::default()
        };
        let scene = scene(&model, &options);
        let bars: Vec<_> = scene.lines().filter(|l| l.role == Role::Bar).collect();
        let curves: Vec<_> = scene.curves().collect();
        assert!(!curves.is_empty(), "{name}");
        assert!(!scene.lines().any(|l| l.role == Role::Connector), "{name}");
        for c in curves {
            let a = c.start;
            for seg in &c.segments {
                let [c1, c2, b] = *seg;
                // Horizontal tangent: each handle is level with its end.
                assert_eq!(c1.1, a.1, "{name}");
                assert_eq!(c2.1, b.1, "{name}");
                // Handles inside the span: x and y stay within the two ends.
                let (lo, hi) = (a.1.min(b.1), a.1.max(b.1));
                let (xl, xr) = (a.0.min(b.0), a.0.max(b.0));
                for k in 0..=50 {
                    let (x, y) = eyrie::layout::connect::bezier_at(a, seg, k as f64 / 50.0);
                    assert!(y >= lo - 1e-9 && y <= hi + 1e-9, "{name}: overshoot");
                    assert!(
                        x >= xl - 1e-9 && x <= xr + 1e-9,
                        "{name}: x leaves the span"
                    );
                }
                // Both ends sit on a bar end.
                for p in [a, b] {
                    assert!(
                        bars.iter().any(|bar| bar
                            .points
                            .iter()
                            .any(|e| (e.0 - p.0).abs() < 1e-9 && (e.1 - p.1).abs() < 1e-9)),
                        "{name}: curve end {p:?} is not on a bar"
                    );
                }
            }
        }
    }
}

#[test]
fn svg_matches_snapshots() {
    let bless = std::env::var("EYRIE_BLESS").is_ok_and(|v| v == "1");
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/snapshots");
    let mut stale = Vec::new();
    for (name, model) in profiles() {
        let svg = to_svg(&scene(&model, &FigureOptions::annotated()));
        let file = dir.join(format!("{name}.svg"));
        if bless {
            std::fs::create_dir_all(&dir).unwrap();
            std::fs::write(&file, &svg).unwrap();
        } else if std::fs::read_to_string(&file).ok().as_deref() != Some(svg.as_str()) {
            stale.push(name);
        }
    }
    assert!(
        stale.is_empty(),
        "SVG differs from tests/snapshots for {stale:?}; if the change is intended, \
         run EYRIE_BLESS=1 cargo test --test layout_profiles and review the diff"
    );
}
