//! Every example profile in `profiles/` through figure → layout → SVG, plain
//! and fully annotated, at single- and double-column width: no two texts
//! (labels, values, annotations, legend, ticks) intersect, no text covers a
//! bar, every text stays on the page, every value sits on its bar or has a
//! leader to it, a page too small says which option helps, smooth connectors
//! keep horizontal ends without overshoot, and the SVG matches its snapshot.
//!
//! Snapshots live in `tests/snapshots/<profile>.svg` (annotated settings).
//! After a deliberate change to layout, rendering or text measurement run
//! `EYRIE_BLESS=1 cargo test --test integration layout_profiles` and review the diff.
//! `EYRIE_RENDER_DUMP=dir` also writes every SVG into `dir` for viewing.

use eyrie::figure::{FigureOptions, diagram_spec};
use eyrie::layout::{Connector, Item, Rect, Role, Scene, Tag, layout, layout_report};
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

/// Plain and with every annotation, at single- and double-column width,
/// and annotated on a slide.
fn settings() -> Vec<(&'static str, FigureOptions)> {
    let at = |preset: &str, o: FigureOptions| FigureOptions {
        preset: preset.into(),
        ..o
    };
    vec![
        ("plain", FigureOptions::default()),
        ("annotated", FigureOptions::annotated()),
        ("plain-double", at("article-wide", FigureOptions::default())),
        (
            "annotated-double",
            at("article-wide", FigureOptions::annotated()),
        ),
        ("slide", at("slide", FigureOptions::annotated())),
    ]
}

/// The scene exactly at the options' size.
fn scene_at(model: &Model, options: &FigureOptions) -> (Scene, eyrie::layout::Crowding) {
    layout_report(&diagram_spec(model, options), &options.style().unwrap())
}

/// The box a horizontal bar of `width_pt` covers (butt ends: no overhang).
fn bar_box(points: &[(f64, f64)], width_pt: f64) -> Rect {
    let half = width_pt * 25.4 / 72.0 / 2.0;
    let xs = points.iter().map(|p| p.0);
    let y = points[0].1;
    Rect {
        x0: xs.clone().fold(f64::INFINITY, f64::min),
        x1: xs.fold(f64::NEG_INFINITY, f64::max),
        y0: y - half,
        y1: y + half,
    }
}

/// The figure as the gallery draws it: more than 16 stationary points make
/// a double-column figure (at 85 mm such a profile leaves out texts and
/// says so; see docs/figures.md).
fn scene(model: &Model, options: &FigureOptions) -> Scene {
    let mut options = options.clone();
    if model.points().len() > 16 && options.preset == "article" {
        options.preset = "article-wide".into();
    }
    layout(&diagram_spec(model, &options), &options.style().unwrap())
}

#[test]
fn no_text_overlaps_covers_a_bar_or_leaves_the_page_in_any_profile() {
    let mut problems = Vec::new();
    for (name, model) in profiles() {
        for (setting, options) in settings() {
            let (scene, _) = scene_at(&model, &options);
            let texts: Vec<_> = scene.texts().collect();
            let bars: Vec<_> = scene
                .lines()
                .filter(|l| l.role == Role::Bar)
                .map(|l| (l.tag.clone(), bar_box(&l.points, l.width_pt)))
                .collect();
            for t in &texts {
                if let Some((tag, _)) = bars.iter().find(|(_, b)| b.intersects(&t.bbox())) {
                    problems.push(format!(
                        "{name}/{setting}: {:?} covers the bar {tag:?}",
                        t.plain_lines()
                    ));
                }
            }
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

/// Every value sits right over or under its own bar (within
/// `layout::ATTACH_MM`, horizontally overlapping it) or has a leader line of
/// its own point that ends on the value's box.
#[test]
fn every_value_sits_on_its_bar_or_has_a_leader() {
    let mut problems = Vec::new();
    let mut leaders_seen = 0;
    for (name, model) in profiles() {
        for (setting, options) in settings() {
            let (scene, _) = scene_at(&model, &options);
            for v in scene.texts().filter(|t| t.role == Role::Value) {
                let b = v.bbox();
                let Some(bar) = scene
                    .lines()
                    .find(|l| l.role == Role::Bar && l.tag.is_some() && l.tag == v.tag)
                else {
                    problems.push(format!("{name}/{setting}: value {:?} has no bar", v.tag));
                    continue;
                };
                let (x0, x1) = (bar.points[0].0, bar.points[1].0);
                let y = bar.points[0].1;
                let gap = (b.y0 - y).max(y - b.y1).max(0.0);
                let on_bar =
                    b.x1 > x0.min(x1) && b.x0 < x0.max(x1) && gap <= eyrie::layout::ATTACH_MM;
                let led = scene.items.iter().any(|i| match i {
                    Item::Line(l) if l.role == Role::Leader && l.tag == v.tag => {
                        let end = *l.points.last().unwrap();
                        b.inflate(0.01).contains(&Rect {
                            x0: end.0,
                            y0: end.1,
                            x1: end.0,
                            y1: end.1,
                        })
                    }
                    _ => false,
                });
                leaders_seen += usize::from(led && !on_bar);
                if !on_bar && !led {
                    let Some(Tag::Point(id)) = &v.tag else {
                        continue;
                    };
                    problems.push(format!(
                        "{name}/{setting}: value of {id} is {gap:.2} mm from its bar, no leader"
                    ));
                }
            }
        }
    }
    assert!(problems.is_empty(), "{problems:#?}");
    // The dense profile at single width displaces some values: the check
    // above has seen leaders, so it can tell the two cases apart.
    assert!(leaders_seen > 0);
}

/// Every profile but the 25-state one holds all its texts on a single
/// column, plain and annotated; the 25-state one at single width leaves
/// texts out and says that the double-column size helps, and at double
/// width holds all its plain texts.
#[test]
fn a_crowded_page_leaves_text_out_only_with_a_warning_naming_the_remedy() {
    for (name, model) in profiles() {
        let dense = model.points().len() > 16;
        for (setting, options) in settings() {
            let (scene, crowding) = scene_at(&model, &options);
            let warning = crowding.warning(&options.style().unwrap());
            if dense && (setting == "plain" || setting == "annotated") {
                let w = warning.unwrap_or_else(|| panic!("{name}/{setting}: no warning"));
                assert!(w.contains("--size double"), "{w}");
                assert!(scene.texts().count() > 0);
            } else if !dense || setting == "plain-double" {
                assert_eq!(warning, None, "{name}/{setting}");
            }
        }
    }
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
         run EYRIE_BLESS=1 cargo test --test integration layout_profiles and review the diff"
    );
}
