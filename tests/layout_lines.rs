//! Texts and lines kept apart, as a journal referee reads a figure: no line
//! of any kind (connector, curve, leader, annotation arrow or guide, axis,
//! zero line) runs through a state's label, its value or an annotation's
//! text, and no leader line cuts through a bar, another text or a connector
//! on its way from its bar to its text.
//!
//! Checked for every profile in `profiles/` at the default settings, at the
//! settings the gallery draws it with (read from `gallery/regenerate.sh`, so
//! the README's figures are the ones tested) and at every setting of
//! `layout_profiles`. A page too small to hold a text clear of every line
//! leaves it out with a warning (see `layout_profiles`); what is drawn is
//! never crossed.

use crate::common;
use crate::layout_profiles::{bar_box, every_scene, profiles};
use eyrie::figure::{AnnotationKind, FigureOptions, diagram_spec};
use eyrie::layout::segment_hits_rect;
use eyrie::layout::{Connector, Crowding, Item, Rect, Role, Scene, layout_report};
use eyrie::model::Model;

/// A stroke from one point to another, mm, and what it is.
type Stroke = (Role, ((f64, f64), (f64, f64)));

/// Every kind of stroke drawn on the page but the bars (kept clear of texts
/// as boxes, see `layout_profiles`).
const LINES: [Role; 8] = [
    Role::Connector,
    Role::Leader,
    Role::Annotation,
    Role::Axis,
    Role::Tick,
    Role::ZeroLine,
    Role::AxisBreak,
    Role::LegendSample,
];

/// The gallery's options for `name`: the `extra=(...)` of its case in
/// `gallery/regenerate.sh` turned into figure options (and the page size,
/// which `--width`/`--height` override).
fn gallery_options(name: &str) -> (FigureOptions, Option<(f64, f64)>, Option<String>) {
    let args = common::gallery_args(name);
    let mut o = FigureOptions::default();
    let mut size = None::<(f64, f64)>;
    let mut unit = None;
    let mut it = args.iter();
    while let Some(flag) = it.next() {
        let mut value = || it.next().unwrap().clone();
        match flag.as_str() {
            "--annotate" => {
                let v = value();
                if v == "all" {
                    o.annotations.extend(AnnotationKind::ALL);
                } else {
                    o.annotations.push(AnnotationKind::from_name(&v).unwrap());
                }
            }
            "--connectors" => {
                o.connector = match value().as_str() {
                    "smooth" => Connector::Smooth,
                    _ => Connector::Straight,
                }
            }
            "--zero-line" => o.zero_line = true,
            "--axis-break" => o.axis_break = true,
            "--size" => {
                if value() == "double" {
                    o.preset = "article-wide".into();
                }
            }
            "--variants" => {
                assert_eq!(value(), "all", "{name}: only --variants all is read here");
                o.variants = (0..16).collect();
            }
            "--width" => {
                let w = value().parse().unwrap();
                size = Some((w, size.map_or(f64::NAN, |s| s.1)));
            }
            "--height" => {
                let h = value().parse().unwrap();
                size = Some((size.map_or(f64::NAN, |s| s.0), h));
            }
            "--unit" => unit = Some(value()),
            other => panic!("{name}: teach this test the gallery's flag {other}"),
        }
    }
    (o, size, unit)
}

/// The scene of `model` with `options` at `size` (NaN: the preset's).
fn scene_with(
    model: &Model,
    options: &FigureOptions,
    size: Option<(f64, f64)>,
) -> (Scene, Crowding) {
    let mut style = options.style().unwrap();
    if let Some((w, h)) = size {
        if w.is_finite() {
            style.width_mm = w;
        }
        if h.is_finite() {
            style.height_mm = h;
        }
    }
    layout_report(&diagram_spec(model, options), &style)
}

/// Default and gallery settings of every profile, then every setting of
/// `layout_profiles`.
fn scenes() -> Vec<(String, Scene, Crowding)> {
    let mut out = Vec::new();
    for (name, model) in profiles() {
        out.push((
            format!("{name}/default"),
            scene_with(&model, &FigureOptions::default(), None).0,
            scene_with(&model, &FigureOptions::default(), None).1,
        ));
        let (options, size, unit) = gallery_options(&name);
        let model = match unit {
            Some(u) => model.with_unit(eyrie::units::EnergyUnit::parse(&u).unwrap()),
            None => model,
        };
        let (scene, crowding) = scene_with(&model, &options, size);
        out.push((format!("{name}/gallery"), scene, crowding));
    }
    out.extend(every_scene());
    out
}

/// True when segments p–q and a–b cross at a point inside both (closed form
/// of two lines' intersection; touching at an end does not count).
fn cross(p: (f64, f64), q: (f64, f64), a: (f64, f64), b: (f64, f64)) -> bool {
    let side = |o: (f64, f64), u: (f64, f64), v: (f64, f64)| {
        (u.0 - o.0) * (v.1 - o.1) - (u.1 - o.1) * (v.0 - o.0)
    };
    let (d1, d2) = (side(a, b, p), side(a, b, q));
    let (d3, d4) = (side(p, q, a), side(p, q, b));
    d1 * d2 < -1e-12 && d3 * d4 < -1e-12
}

#[test]
fn cross_is_the_closed_form() {
    // The diagonals of a square cross at its centre; parallel sides and
    // segments meeting at an end do not cross.
    assert!(cross((0.0, 0.0), (2.0, 2.0), (0.0, 2.0), (2.0, 0.0)));
    assert!(!cross((0.0, 0.0), (2.0, 0.0), (0.0, 1.0), (2.0, 1.0)));
    assert!(!cross((0.0, 0.0), (1.0, 1.0), (1.0, 1.0), (2.0, 0.0)));
}

/// No stroke of any kind runs through the ink (the box 0.25 mm inside its
/// side bearings and line gap) of a value, a label or an annotation's text.
#[test]
fn no_line_crosses_a_label_a_value_or_an_annotation_text() {
    let mut problems = Vec::new();
    for (name, scene, _) in scenes() {
        let strokes: Vec<Stroke> = LINES
            .iter()
            .flat_map(|&r| scene.strokes(r).into_iter().map(move |s| (r, s)))
            .collect();
        for t in scene
            .texts()
            .filter(|t| matches!(t.role, Role::Value | Role::Label | Role::AnnotationText))
        {
            let ink = t.bbox().inflate(-0.25);
            for (role, (a, b)) in &strokes {
                if segment_hits_rect(*a, *b, &ink) {
                    problems.push(format!(
                        "{name}: a {role:?} line crosses {:?} ({:?})",
                        t.plain_lines(),
                        t.role
                    ));
                    break;
                }
            }
        }
    }
    assert!(
        problems.is_empty(),
        "{} crossings: {problems:#?}",
        problems.len()
    );
}

/// A leader leads from its bar to its own text without cutting through a
/// bar, another text, a connector, an annotation's arrow or bracket or
/// another leader: a leader across any of them seems to point at the wrong
/// thing.
#[test]
fn leaders_cross_no_bar_no_other_text_and_no_line() {
    let mut problems = Vec::new();
    for (name, scene, _) in scenes() {
        let bars: Vec<Rect> = scene
            .lines()
            .filter(|l| l.role == Role::Bar)
            .map(|l| bar_box(&l.points, l.width_pt))
            .collect();
        let texts: Vec<(Vec<String>, Rect)> =
            scene.texts().map(|t| (t.plain_lines(), t.bbox())).collect();
        // Connectors, leaders and annotation arrows and brackets; an
        // annotation's dotted guide (a faint reference line of no state) may
        // be crossed, as may the zero line.
        let mut others: Vec<Stroke> = Vec::new();
        for role in [Role::Connector, Role::Leader] {
            others.extend(scene.strokes(role).into_iter().map(|s| (role, s)));
        }
        for l in scene
            .lines()
            .filter(|l| l.role == Role::Annotation && l.dash.is_none())
        {
            others.extend(
                l.points
                    .windows(2)
                    .map(|w| (Role::Annotation, (w[0], w[1]))),
            );
        }
        for item in &scene.items {
            let Item::Line(l) = item else { continue };
            if l.role != Role::Leader {
                continue;
            }
            let (from, to) = (l.points[0], *l.points.last().unwrap());
            for w in l.points.windows(2) {
                let (a, b) = (w[0], w[1]);
                // Bars: the leader starts on its own bar's edge, which is
                // not a passage through it.
                for r in &bars {
                    if segment_hits_rect(a, b, r) {
                        problems.push(format!("{name}: leader {from:?}→{to:?} crosses a bar"));
                    }
                }
                // Texts: its own text is the one its end touches.
                for (lines, r) in &texts {
                    let own = r.inflate(0.01).contains(&Rect {
                        x0: to.0,
                        y0: to.1,
                        x1: to.0,
                        y1: to.1,
                    });
                    if !own && segment_hits_rect(a, b, r) {
                        problems.push(format!("{name}: leader {from:?}→{to:?} crosses {lines:?}"));
                    }
                }
                for (role, (p, q)) in &others {
                    if cross(a, b, *p, *q) {
                        problems.push(format!(
                            "{name}: leader {from:?}→{to:?} crosses a {role:?} line"
                        ));
                    }
                }
            }
        }
    }
    assert!(
        problems.is_empty(),
        "{} cases: {problems:#?}",
        problems.len()
    );
}

/// The README's figures are complete: at the gallery's settings every
/// profile shows all its values, labels and annotations (nothing left out
/// for want of a clear spot).
#[test]
fn the_gallery_figures_leave_nothing_out() {
    for (name, model) in profiles() {
        let (options, size, unit) = gallery_options(&name);
        let model = match unit {
            Some(u) => model.with_unit(eyrie::units::EnergyUnit::parse(&u).unwrap()),
            None => model,
        };
        let (_, crowding) = scene_with(&model, &options, size);
        assert!(
            crowding.left_out.is_empty(),
            "{name}: {:?}",
            crowding.left_out
        );
    }
}
