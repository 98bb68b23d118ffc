//! End-to-end checks of layout + SVG on hand-built diagram specs (invented
//! data): the document parses as XML, shows every text, escapes hostile
//! labels, is byte-identical across runs, and no two texts overlap.
//!
//! Set `EYRIE_RENDER_DUMP=dir` to also write each SVG into `dir` for viewing.

use eyrie::layout::{DiagramSpec, Item, Role, ShownPath, ShownPoint, Style, layout};
use eyrie::model::Kind;
use eyrie::render::to_svg;

fn point(id: &str, label: &str, kind: Kind, value: f64) -> ShownPoint {
    ShownPoint {
        id: id.into(),
        label: label.into(),
        kind,
        value,
        value_text: eyrie::format::energy(value, 1, true),
    }
}

fn path(name: &str, via: &[usize]) -> ShownPath {
    ShownPath {
        name: name.into(),
        via: via.to_vec(),
    }
}

/// The demo network: concerted vs stepwise, with a fragmentation branch.
fn demo() -> DiagramSpec {
    use Kind::*;
    DiagramSpec {
        title: Some("Concerted versus stepwise rearrangement".into()),
        axis_label: "ΔG (kcal mol⁻¹)".into(),
        points: vec![
            point("ether", "allyl ether", Minimum, 0.0),
            point("pair", "radical pair", Minimum, 14.2),
            point("ketone", "rearranged ketone", Minimum, -15.8),
            point("fragments", "diene + phenol", Minimum, -4.1),
            point("ts-concerted", "TS-concerted", TransitionState, 27.3),
            point("ts-homolysis", "TS-homolysis", TransitionState, 25.1),
            point("ts-recombine", "TS-recombination", TransitionState, 17.5),
            point("ts-fragment", "TS-fragmentation", TransitionState, 19.6),
        ],
        paths: vec![
            path("concerted", &[0, 4, 2]),
            path("stepwise", &[0, 5, 1, 6, 2]),
            path("fragmentation", &[1, 7, 3]),
        ],
        ..Default::default()
    }
}

/// A single-path catalytic cycle with two adjacent minima (kJ/mol).
fn cycle() -> DiagramSpec {
    use Kind::*;
    DiagramSpec {
        title: None,
        axis_label: "ΔG (kJ mol⁻¹)".into(),
        points: vec![
            point("cat", "[M] + substrate", Minimum, 0.0),
            point("adduct", "[M]·substrate", Minimum, -28.0),
            point("ts-insert", "TS-insertion", TransitionState, 64.0),
            point("insert", "insertion product", Minimum, -9.5),
            point("ts-elim", "TS-elimination", TransitionState, 72.5),
            point("release", "[M] + product", Minimum, -61.0),
        ],
        paths: vec![path("turnover", &[0, 1, 2, 3, 4, 5])],
        ..Default::default()
    }
}

/// Two rotamers, each cyclising to its own product.
fn conformers() -> DiagramSpec {
    use Kind::*;
    DiagramSpec {
        title: Some("Two rotamers".into()),
        axis_label: "ΔG (kcal mol⁻¹)".into(),
        points: vec![
            point("rot-e", "E-rotamer", Minimum, 0.0),
            point("rot-z", "Z-rotamer", Minimum, 0.9),
            point("prod-a", "cis product", Minimum, -8.2),
            point("prod-b", "trans product", Minimum, -7.4),
            point("ts-rot", "TS-rotation", TransitionState, 12.5),
            point("ts-a", "TS-cis", TransitionState, 19.4),
            point("ts-b", "TS-trans", TransitionState, 18.1),
        ],
        paths: vec![
            path("rotation", &[0, 4, 1]),
            path("cis", &[0, 5, 2]),
            path("trans", &[1, 6, 3]),
        ],
        ..Default::default()
    }
}

/// 25 points on 4 paths with near-equal energies and long labels: a main
/// chain of 13 points and three branches leaving and rejoining it.
fn dense() -> DiagramSpec {
    let mut points = Vec::new();
    for i in 0..25 {
        let kind = if i % 2 == 1 {
            Kind::TransitionState
        } else {
            Kind::Minimum
        };
        // Near-equal energies: all within ±1.5 of 10, deterministic wobble.
        let value = 10.0 + ((i * 7) % 11) as f64 * 0.3 - 1.5;
        let label = match kind {
            Kind::TransitionState => format!("TS-{i} (C–H cleavage)"),
            Kind::Minimum => format!("intermediate {i}"),
        };
        points.push(point(&format!("p{i}"), &label, kind, value));
    }
    DiagramSpec {
        title: Some("dense".into()),
        axis_label: "ΔG (kcal mol⁻¹)".into(),
        points,
        paths: vec![
            path("main", &[0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]),
            path("branch-a", &[2, 13, 14, 15, 16, 17, 8]),
            path("branch-b", &[4, 19, 18, 21, 20]),
            path("branch-c", &[10, 23, 22, 24, 24]),
        ],
        ..Default::default()
    }
}

fn hostile() -> DiagramSpec {
    use Kind::*;
    DiagramSpec {
        title: Some("<title> & \"quotes\"".into()),
        axis_label: "ΔG <kcal> & 'mol'".into(),
        points: vec![
            point("a\"><script>", "<script>alert(1)</script>", Minimum, 0.0),
            point("b&c", "A & B", TransitionState, 12.0),
            point("d'e", "\"quoted\" 'single'", Minimum, -3.0),
        ],
        paths: vec![path("p<1>", &[0, 1, 2]), path("p\"2\" & 'x'", &[0, 2])],
        ..Default::default()
    }
}

fn all_specs() -> Vec<(&'static str, DiagramSpec)> {
    vec![
        ("demo", demo()),
        ("cycle", cycle()),
        ("conformers", conformers()),
        ("dense", dense()),
        ("hostile", hostile()),
    ]
}

fn render(name: &str, spec: &DiagramSpec) -> String {
    let svg = to_svg(&layout(spec, &Style::default()));
    if let Ok(dir) = std::env::var("EYRIE_RENDER_DUMP") {
        std::fs::write(format!("{dir}/{name}.svg"), &svg).unwrap();
    }
    svg
}

/// All text content of the document, one entry per `<text>` (tspans joined by a space).
fn texts(doc: &roxmltree::Document<'_>) -> Vec<String> {
    doc.descendants()
        .filter(|n| n.has_tag_name("text"))
        .map(|n| {
            let parts: Vec<&str> = n
                .descendants()
                .filter(|d| d.is_text())
                .filter_map(|d| d.text())
                .filter(|t| !t.is_empty())
                .collect();
            parts.join(" ")
        })
        .collect()
}

#[test]
fn svg_parses_and_has_page_size_in_mm() {
    for (name, spec) in all_specs() {
        let svg = render(name, &spec);
        let doc = roxmltree::Document::parse(&svg).unwrap_or_else(|e| panic!("{name}: {e}"));
        let root = doc.root_element();
        assert_eq!(root.attribute("width"), Some("85.000mm"));
        assert_eq!(root.attribute("height"), Some("65.000mm"));
        assert_eq!(root.attribute("viewBox"), Some("0 0 85.000 65.000"));
        assert!(
            root.attribute("font-family")
                .unwrap()
                .contains("sans-serif")
        );
    }
}

#[test]
fn every_label_and_value_is_shown() {
    for (name, spec) in all_specs() {
        let svg = render(name, &spec);
        let doc = roxmltree::Document::parse(&svg).unwrap();
        let shown = texts(&doc);
        // What a page too small for its texts left out, and said so (type
        // stays at 6 pt or more; see layout::smallest_pt).
        let (_, crowding) = eyrie::layout::layout_report(&spec, &Style::default());
        for p in &spec.points {
            // A label broken over lines comes back with a space at the break
            // (or directly after a hyphen); compare without spaces.
            let squash = |s: &str| s.replace(' ', "");
            assert!(
                shown.iter().any(|t| squash(t) == squash(&p.label))
                    || (name == "dense" && crowding.left_out.contains(&p.label)),
                "{name}: label {:?} missing in {shown:?}",
                p.label
            );
            assert!(
                shown.contains(&p.value_text),
                "{name}: value {:?} missing",
                p.value_text
            );
        }
        assert!(shown.contains(&spec.axis_label), "{name}: axis label");
    }
}

#[test]
fn hostile_text_is_escaped_everywhere() {
    let svg = render("hostile", &hostile());
    assert!(!svg.contains("<script>"));
    assert!(svg.contains("&lt;script&gt;alert(1)&lt;/script&gt;"));
    assert!(svg.contains("A &amp;"));
    assert!(svg.contains("&quot;quoted&quot; &apos;single&apos;"));
    assert!(svg.contains("<title>&lt;title&gt; &amp; &quot;quotes&quot;</title>"));
    let doc = roxmltree::Document::parse(&svg).unwrap();
    // Attributes round-trip exactly.
    let ids: Vec<&str> = doc
        .descendants()
        .filter_map(|n| n.attribute("data-id"))
        .collect();
    assert!(ids.contains(&"a\"><script>"));
    assert!(ids.contains(&"d'e"));
    let paths: Vec<&str> = doc
        .descendants()
        .filter_map(|n| n.attribute("data-path"))
        .collect();
    assert!(paths.contains(&"p\"2\" & 'x'"));
    // Only the elements we write exist.
    for n in doc.descendants().filter(|n| n.is_element()) {
        assert!(
            ["svg", "title", "rect", "line", "polyline", "text", "tspan"]
                .contains(&n.tag_name().name()),
            "unexpected element {:?}",
            n.tag_name()
        );
    }
}

#[test]
fn output_is_byte_identical_across_runs() {
    for (name, spec) in all_specs() {
        let a = render(name, &spec);
        let b = to_svg(&layout(&spec.clone(), &Style::default()));
        assert_eq!(a, b, "{name}");
    }
}

#[test]
fn no_two_texts_overlap_and_all_stay_on_the_page() {
    for (name, spec) in all_specs() {
        let scene = layout(&spec, &Style::default());
        let boxes = scene.text_boxes();
        let texts: Vec<_> = scene.texts().collect();
        if let Some(&(i, j)) = scene.overlapping_texts().first() {
            panic!(
                "{name}: {:?} overlaps {:?}",
                texts[i].plain_lines(),
                texts[j].plain_lines()
            );
        }
        for (b, t) in boxes.iter().zip(&texts) {
            assert!(
                b.x0 >= 0.0 && b.y0 >= 0.0 && b.x1 <= scene.width_mm && b.y1 <= scene.height_mm,
                "{name}: {:?} leaves the page: {b:?}",
                t.plain_lines()
            );
        }
    }
}

#[test]
fn texts_do_not_cover_bars() {
    for (name, spec) in all_specs() {
        let scene = layout(&spec, &Style::default());
        let bars: Vec<_> = scene.lines().filter(|l| l.role == Role::Bar).collect();
        assert_eq!(bars.len(), spec.points.len(), "{name}: one bar per point");
        for t in scene.texts() {
            let b = t.bbox();
            for bar in &bars {
                let (x0, y) = bar.points[0];
                let x1 = bar.points[1].0;
                let inside = y > b.y0 && y < b.y1 && x1 > b.x0 && x0 < b.x1;
                assert!(!inside, "{name}: {:?} covers a bar", t.plain_lines());
            }
        }
    }
}

#[test]
fn connectors_meet_bar_ends_and_shared_steps_are_drawn_once() {
    let spec = demo();
    let scene = layout(&spec, &Style::default());
    let bars: Vec<_> = scene.lines().filter(|l| l.role == Role::Bar).collect();
    let connectors: Vec<_> = scene
        .lines()
        .filter(|l| l.role == Role::Connector)
        .collect();
    // 2 + 4 + 2 distinct steps in the demo.
    assert_eq!(connectors.len(), 8);
    let ends: Vec<(f64, f64)> = bars
        .iter()
        .flat_map(|b| [b.points[0], b.points[1]])
        .collect();
    for c in &connectors {
        for p in [c.points[0], c.points[1]] {
            assert!(
                ends.iter()
                    .any(|e| (e.0 - p.0).abs() < 1e-9 && (e.1 - p.1).abs() < 1e-9),
                "connector end {p:?} is not at a bar end"
            );
        }
        assert!(c.dash.is_some());
    }
}

#[test]
fn legend_only_with_several_paths_and_title_is_metadata() {
    let one = layout(&cycle(), &Style::default());
    assert!(!one.texts().any(|t| t.role == Role::LegendText));
    let three = layout(&demo(), &Style::default());
    let names: Vec<_> = three
        .texts()
        .filter(|t| t.role == Role::LegendText)
        .map(|t| t.plain_lines()[0].clone())
        .collect();
    assert_eq!(names, vec!["concerted", "stepwise", "fragmentation"]);
    assert_eq!(
        three.title.as_deref(),
        Some("Concerted versus stepwise rearrangement")
    );
    assert!(!three.texts().any(|t| {
        t.plain_lines()
            .iter()
            .any(|l| l.contains("Concerted versus"))
    }));
}

#[test]
fn degenerate_specs_still_give_a_valid_figure() {
    use Kind::*;
    let cases = vec![
        DiagramSpec {
            title: None,
            axis_label: String::new(),
            points: vec![],
            paths: vec![],
            ..Default::default()
        },
        DiagramSpec {
            title: None,
            axis_label: "ΔG".into(),
            points: vec![point("only", "lonely", Minimum, 3.0)],
            paths: vec![path("p", &[0])],
            ..Default::default()
        },
        DiagramSpec {
            title: None,
            axis_label: "ΔG".into(),
            points: (0..5)
                .map(|i| point(&format!("s{i}"), "same", Minimum, 1.0))
                .collect(),
            paths: vec![path("flat", &[0, 1, 2, 3, 4]), path("empty", &[])],
            ..Default::default()
        },
        DiagramSpec {
            title: None,
            axis_label: "ΔG".into(),
            points: vec![
                point("a", "a", Minimum, 0.0),
                point("nan", "not a number", TransitionState, f64::NAN),
                point("b", "b", Minimum, -1.0),
                point("loose", "on no path", Minimum, 2.0),
            ],
            paths: vec![path("p", &[0, 1, 2, 99]), path("cycle", &[0, 2, 0])],
            ..Default::default()
        },
    ];
    for spec in cases {
        let scene = layout(&spec, &Style::default());
        let svg = to_svg(&scene);
        roxmltree::Document::parse(&svg).unwrap();
        assert!(scene.overlapping_texts().is_empty());
        for item in &scene.items {
            if let Item::Line(l) = item {
                assert!(l.points.iter().all(|(x, y)| x.is_finite() && y.is_finite()));
            }
        }
    }
}
