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
use eyrie::layout::{
    Connector, Item, Rect, Role, Scene, Tag, layout, layout_report, segment_hits_rect,
};
use eyrie::model::Model;
use eyrie::render::to_svg;
use std::path::Path;

pub(crate) fn profiles() -> Vec<(String, Model)> {
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
pub(crate) fn settings() -> Vec<(&'static str, FigureOptions)> {
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
pub(crate) fn bar_box(points: &[(f64, f64)], width_pt: f64) -> Rect {
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

/// Every profile and setting, and the profile with variants drawn over it
/// (plain and annotated): the scenes the figure checks below look at.
pub(crate) fn every_scene() -> Vec<(String, Scene, eyrie::layout::Crowding)> {
    let mut out = Vec::new();
    for (name, model) in profiles() {
        for (setting, options) in settings() {
            let (scene, crowding) = scene_at(&model, &options);
            out.push((format!("{name}/{setting}"), scene, crowding));
        }
        if !model.variants().is_empty() {
            let all: Vec<usize> = (0..model.variants().len()).collect();
            for (setting, options) in [
                ("variants", FigureOptions::default()),
                ("variants-annotated", FigureOptions::annotated()),
            ] {
                let options = FigureOptions {
                    variants: all.clone(),
                    ..options
                };
                let (scene, crowding) = scene_at(&model, &options);
                out.push((format!("{name}/{setting}"), scene, crowding));
            }
        }
    }
    out
}

/// An annotation's number must be read on its own: no connector crosses its
/// text (the glyphs' ink, 0.25 mm inside the box), and no arrow or bracket
/// passes through a bar on its way (variants' bars included), only at its
/// two ends.
#[test]
fn annotation_texts_cross_no_connector_and_marks_cross_no_bar() {
    let mut problems = Vec::new();
    for (name, scene, _) in every_scene() {
        let connectors = scene.strokes(Role::Connector);
        for t in scene.texts().filter(|t| t.role == Role::AnnotationText) {
            let ink = t.bbox().inflate(-0.25);
            if connectors
                .iter()
                .any(|(a, b)| segment_hits_rect(*a, *b, &ink))
            {
                problems.push(format!("{name}: a connector crosses {:?}", t.plain_lines()));
            }
        }
        let bars: Vec<Rect> = scene
            .lines()
            .filter(|l| l.role == Role::Bar)
            .map(|l| bar_box(&l.points, l.width_pt))
            .collect();
        for l in scene.lines().filter(|l| l.role == Role::Annotation) {
            for w in l.points.windows(2) {
                let (a, b) = (w[0], w[1]);
                if (a.0 - b.0).abs() > 1e-9 || (a.1 - b.1).abs() < 1.5 {
                    continue; // only shafts (vertical strokes) run past bars
                }
                let (top, bottom) = (a.1.min(b.1) + 0.6, a.1.max(b.1) - 0.6);
                if bars
                    .iter()
                    .any(|r| segment_hits_rect((a.0, top), (a.0, bottom), r))
                {
                    problems.push(format!(
                        "{name}: an annotation mark at x = {:.1} crosses a bar",
                        a.0
                    ));
                }
            }
        }
    }
    assert!(problems.is_empty(), "{problems:#?}");
}

/// Product ends (states no path leaves) line up in the last column unless
/// their energies are so close that their values and labels would crowd
/// one column; then they step right, so no two ends share a column within
/// a value and a label's height (about 5 mm at 7 pt). Neighbouring texts on
/// one line keep more than a word space apart (1.5 mm), or two labels read
/// as one.
#[test]
fn product_ends_and_neighbouring_texts_keep_apart() {
    let mut problems = Vec::new();
    for (name, model) in profiles() {
        let ids: Vec<&str> = model.points().iter().map(|p| p.id.as_str()).collect();
        let ends: Vec<&str> = (0..ids.len())
            .filter(|&i| {
                let last = model.paths().iter().any(|p| p.via.last() == Some(&i));
                let left = model
                    .paths()
                    .iter()
                    .any(|p| p.via.iter().rev().skip(1).any(|&v| v == i));
                last && !left
            })
            .map(|i| ids[i])
            .collect();
        // (The 25-state profile needs the double width; see `scene`.)
        for (setting, options) in [settings()[0].clone(), settings()[2].clone()] {
            if model.points().len() > 16 && setting == "plain" {
                continue;
            }
            let (scene, _) = scene_at(&model, &options);
            let bars: Vec<(&str, Rect)> = scene
                .lines()
                .filter(|l| l.role == Role::Bar)
                .filter_map(|l| match &l.tag {
                    Some(Tag::Point(id)) if ends.contains(&id.as_str()) => {
                        Some((id.as_str(), bar_box(&l.points, l.width_pt)))
                    }
                    _ => None,
                })
                .collect();
            for (i, (a, ra)) in bars.iter().enumerate() {
                for (b, rb) in &bars[i + 1..] {
                    // Side-by-side slots of one column count as one column.
                    let centre = |r: &Rect| (r.x0 + r.x1) / 2.0;
                    let longer = (ra.x1 - ra.x0).max(rb.x1 - rb.x0);
                    let same_column = (centre(ra) - centre(rb)).abs() < longer + 2.0;
                    if same_column && (ra.y0 - rb.y0).abs() < 5.0 {
                        problems.push(format!(
                            "{name}/{setting}: ends {a} and {b} crowd one column"
                        ));
                    }
                }
            }
            let placed: Vec<_> = scene
                .texts()
                .filter(|t| matches!(t.role, Role::Value | Role::Label | Role::AnnotationText))
                .map(|t| (t.plain_lines(), t.bbox()))
                .collect();
            for (i, (ta, a)) in placed.iter().enumerate() {
                for (tb, b) in &placed[i + 1..] {
                    let level = a.y0 < b.y1 && b.y0 < a.y1;
                    let gap = (b.x0 - a.x1).max(a.x0 - b.x1);
                    if level && gap < 1.5 - 1e-9 {
                        problems.push(format!(
                            "{name}/{setting}: {ta:?} and {tb:?} {gap:.2} mm apart"
                        ));
                    }
                }
            }
        }
    }
    assert!(problems.is_empty(), "{problems:#?}");
}

/// Common practice: about 6 pt is the smallest type that stays legible at
/// a figure's final size; a crowded figure leaves texts out (with a warning)
/// rather than shrink below it.
#[test]
fn no_text_is_smaller_than_six_points() {
    for (name, scene, _) in every_scene() {
        for t in scene.texts() {
            assert!(
                t.size_pt >= 6.0 - 1e-9,
                "{name}: {:?} is set in {:.2} pt",
                t.plain_lines(),
                t.size_pt
            );
        }
    }
}

#[test]
fn annotations_appear_where_the_analysis_has_them() {
    let all = profiles();
    let get = |n: &str| &all.iter().find(|(name, _)| name == n).unwrap().1;
    // At double width, where every annotation fits (a single column may
    // leave some out, with a warning).
    let annotated = FigureOptions {
        preset: "article-wide".into(),
        ..FigureOptions::annotated()
    };
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
    // Powers of ten as a reader writes them, not computer notation:
    // 2.09e-3 s⁻¹ is set as 2.09 × 10⁻³ s⁻¹ (exponent in superscript runs).
    assert!(cyc.iter().any(|t| t.contains("× 10−3 s−1")), "{cyc:?}");
    assert!(!cyc.iter().any(|t| t.contains("e-")), "{cyc:?}");
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
/// `layout::ATTACH_MM`, horizontally overlapping it, its own label stacked in
/// between allowed), right beside one of its ends (within 1 mm, level with
/// it) or has a leader line of its own point that ends on the value's box.
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
                let (x0, x1) = (x0.min(x1), x0.max(x1));
                let y = bar.points[0].1;
                let mut gap = (b.y0 - y).max(y - b.y1).max(0.0);
                // Its own label stacked between value and bar reads as one
                // block with it: the label's height and the line gap of a
                // stack (0.6 mm) do not count.
                for l in scene
                    .texts()
                    .filter(|t| t.role == Role::Label && t.tag == v.tag)
                {
                    let r = l.bbox();
                    let between = if b.y1 <= y {
                        r.y0 >= b.y1 && r.y1 <= y
                    } else {
                        r.y1 <= b.y0 && r.y0 >= y
                    };
                    if between && r.x1 > x0 && r.x0 < x1 {
                        gap -= r.y1 - r.y0 + 0.6;
                    }
                }
                // Level with the bar, right beside one of its ends.
                let side_gap = (b.x0 - x1).max(x0 - b.x1);
                let beside = b.y0 < y && y < b.y1 && (0.0..=1.0).contains(&side_gap);
                let on_bar = beside || (b.x1 > x0 && b.x0 < x1 && gap <= eyrie::layout::ATTACH_MM);
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

/// Every profile but the 25-state one holds all its values and labels on a
/// single column, plain and annotated, and all its plain texts; annotated, it
/// may leave out an annotation, and then the warning names it and the
/// double-column size. The 25-state one at single width leaves texts out
/// and says that the double-column size helps; at 175 × 90 mm it may still
/// leave out a few names hemmed in by lines, and says a larger page helps
/// (at the gallery's 175 × 120 mm it holds everything, see `layout_lines`).
#[test]
fn a_crowded_page_leaves_text_out_only_with_a_warning_naming_the_remedy() {
    for (name, model) in profiles() {
        let dense = model.points().len() > 16;
        let labelled = model
            .points()
            .iter()
            .filter(|p| !p.label.trim().is_empty())
            .count();
        for (setting, options) in settings() {
            let (scene, crowding) = scene_at(&model, &options);
            let warning = crowding.warning(&options.style().unwrap());
            let annotated = !options.annotations.is_empty();
            let count = |role: Role| scene.texts().filter(|t| t.role == role).count();
            if dense && (setting == "plain" || setting == "annotated") {
                let w = warning.unwrap_or_else(|| panic!("{name}/{setting}: no warning"));
                assert!(w.contains("--size double"), "{w}");
                assert!(scene.texts().count() > 0);
            } else if !dense && annotated {
                assert_eq!(count(Role::Value), model.points().len(), "{name}/{setting}");
                assert_eq!(count(Role::Label), labelled, "{name}/{setting}");
                if let Some(w) = warning {
                    let help = if setting == "annotated" {
                        "--size double"
                    } else {
                        "fewer --annotate items"
                    };
                    assert!(w.contains(help), "{name}/{setting}: {w}");
                    for t in &crowding.left_out {
                        assert!(w.contains(t.as_str()) || w.contains("more"), "{w}");
                    }
                }
            } else if !dense {
                assert_eq!(warning, None, "{name}/{setting}");
            } else if let Some(w) = warning {
                // 175 × 90 mm is not quite enough for 25 states and their
                // names clear of every line (the gallery draws it taller,
                // see `layout_lines`): it says so.
                assert!(
                    w.contains("larger --width/--height"),
                    "{name}/{setting}: {w}"
                );
                if !annotated {
                    assert!(crowding.left_out.len() <= 3, "{name}/{setting}: {w}");
                }
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
