//! The XY chart layout (`layout::chart`): tick choice, dropped points, legend
//! placement, markers, no overlapping text at every preset, same bytes twice,
//! PNG pixel size.

use eyrie::layout::chart::{AxisScale, ChartSpec, Marker, Series, layout_chart, ticks};
use eyrie::layout::{Item, Role, Scene, Style};

fn values(scale: AxisScale, lo: f64, hi: f64) -> Vec<f64> {
    ticks(scale, lo, hi).iter().map(|t| t.value).collect()
}

fn close(a: &[f64], b: &[f64]) -> bool {
    a.len() == b.len()
        && a.iter()
            .zip(b)
            .all(|(x, y)| (x - y).abs() <= 1e-9 * y.abs().max(1.0))
}

#[test]
fn linear_ticks_are_one_two_five_steps_covering_the_data() {
    // Closed form of the 1-2-5 rule: 0..97 needs 100 at the top; steps of 20
    // give six ticks, the count the rule aims for.
    let v = values(AxisScale::Linear, 0.0, 97.0);
    assert!(close(&v, &[0.0, 20.0, 40.0, 60.0, 80.0, 100.0]), "{v:?}");
    // −78..100 °C: steps of 50 from −100 (closed form, same rule).
    let v = values(AxisScale::Linear, -78.0, 100.0);
    assert!(close(&v, &[-100.0, -50.0, 0.0, 50.0, 100.0]), "{v:?}");
    let labels: Vec<String> = ticks(AxisScale::Linear, 0.0, 0.97)
        .into_iter()
        .map(|t| t.label)
        .collect();
    assert_eq!(labels, ["0.0", "0.2", "0.4", "0.6", "0.8", "1.0"]);
    // Negative numbers carry the true minus sign (typographic, as the diagrams).
    assert_eq!(
        ticks(AxisScale::Linear, -78.0, 100.0)[0].label,
        "\u{2212}100"
    );
}

#[test]
fn log_ticks_are_whole_decades() {
    // 1e-3..1e2 spans exactly five decades: six ticks, 10⁻³ to 10² (closed form).
    let t = ticks(AxisScale::Log10, 1e-3, 1e2);
    assert!(
        close(
            &t.iter().map(|t| t.value).collect::<Vec<_>>(),
            &[1e-3, 1e-2, 1e-1, 1.0, 10.0, 100.0]
        ),
        "{t:?}"
    );
    assert_eq!(t[0].label, "10^{-3}");
    assert_eq!(t[5].label, "10^{2}");
    // Inside one decade the axis still shows two: 1 and 10.
    assert!(close(&values(AxisScale::Log10, 2.0, 5.0), &[1.0, 10.0]));
    // Bounds between decades round outwards: 0.02..300 → 10⁻²..10³.
    assert_eq!(values(AxisScale::Log10, 0.02, 300.0).len(), 6);
}

/// Three crossing lines with a marker: what `sweep --plot` draws.
fn crossing() -> ChartSpec {
    let t: Vec<f64> = (0..=36).map(|i| -78.0 + i as f64 * 5.0).collect();
    let a: Vec<(f64, f64)> = t
        .iter()
        .map(|&x| (x, 80.0 - 60.0 * (x + 78.0) / 178.0))
        .collect();
    let b: Vec<(f64, f64)> = a.iter().map(|&(x, y)| (x, 90.0 - y)).collect();
    let c: Vec<(f64, f64)> = a.iter().map(|&(x, _)| (x, 10.0)).collect();
    ChartSpec {
        title: Some("three products".into()),
        x_title: "temperature (°C)".into(),
        y_title: "share of product (%)".into(),
        y_include: vec![0.0, 100.0],
        series: vec![
            Series {
                name: "*endo* adduct".into(),
                points: a,
            },
            Series {
                name: "*exo* adduct".into(),
                points: b,
            },
            Series {
                name: "CO_2 loss".into(),
                points: c,
            },
        ],
        markers: vec![
            Marker {
                x: 4.0,
                label: "isoselective: 4.0 °C".into(),
            },
            Marker {
                x: 500.0,
                label: "outside".into(),
            },
        ],
        ..ChartSpec::default()
    }
}

/// Concentrations over twelve decades of time: what `simulate --plot
/// --log-time` draws.
fn decay() -> ChartSpec {
    let t: Vec<f64> = (0..=60)
        .map(|i| 10f64.powf(-9.0 + i as f64 * 0.2))
        .collect();
    let k = 1e-1;
    ChartSpec {
        x_title: "time (s)".into(),
        y_title: "concentration (mol L^-1)".into(),
        x_scale: AxisScale::Log10,
        y_include: vec![0.0],
        series: vec![
            Series {
                name: "substrate".into(),
                points: t.iter().map(|&t| (t, (-k * t).exp())).collect(),
            },
            Series {
                name: "product".into(),
                points: t.iter().map(|&t| (t, 1.0 - (-k * t).exp())).collect(),
            },
        ],
        ..ChartSpec::default()
    }
}

fn texts(scene: &Scene) -> Vec<String> {
    scene.texts().map(|t| t.plain_lines().join(" ")).collect()
}

#[test]
fn no_text_overlaps_at_any_preset() {
    for preset in ["article", "article-wide", "slide", "poster"] {
        let style = Style::preset(preset).unwrap();
        for spec in [crossing(), decay()] {
            let scene = layout_chart(&spec, &style);
            assert!(
                scene.overlapping_texts().is_empty(),
                "{preset}: {:?} in {:?}",
                scene.overlapping_texts(),
                texts(&scene)
            );
            let page = eyrie::layout::Rect {
                x0: 0.0,
                y0: 0.0,
                x1: scene.width_mm,
                y1: scene.height_mm,
            };
            for t in scene.texts() {
                assert!(page.contains(&t.bbox()), "{preset}: {:?} off the page", t);
            }
        }
    }
}

#[test]
fn every_series_is_in_the_legend_and_markers_outside_the_range_are_left_out() {
    let scene = layout_chart(&crossing(), &Style::default());
    let all = texts(&scene);
    for name in [
        "endo adduct",
        "exo adduct",
        "CO2 loss",
        "isoselective: 4.0 °C",
    ] {
        assert!(all.iter().any(|t| t == name), "{name} missing from {all:?}");
    }
    assert!(!all.iter().any(|t| t == "outside"));
    let markers = scene.lines().filter(|l| l.role == Role::Annotation).count();
    assert_eq!(markers, 1);
    // One line per series, the first solid and the others dashed.
    let data: Vec<_> = scene
        .lines()
        .filter(|l| l.role == Role::Connector)
        .collect();
    assert_eq!(data.len(), 3);
    assert!(data[0].dash.is_none() && data[1].dash.is_some() && data[2].dash.is_some());
    assert_ne!(data[0].colour, data[1].colour);
}

#[test]
fn log_axis_drops_non_positive_points_and_breaks_the_line_there() {
    let spec = ChartSpec {
        x_scale: AxisScale::Log10,
        series: vec![Series {
            name: "a".into(),
            points: vec![
                (0.0, 1.0),
                (1.0, 1.0),
                (10.0, 2.0),
                (-5.0, 2.0),
                (100.0, 3.0),
                (1000.0, 4.0),
                (f64::NAN, 1.0),
            ],
        }],
        ..ChartSpec::default()
    };
    let scene = layout_chart(&spec, &Style::default());
    let lengths: Vec<usize> = scene
        .lines()
        .filter(|l| l.role == Role::Connector)
        .map(|l| l.points.len())
        .collect();
    // (1,1)-(10,2) and (100,3)-(1000,4): the negative x splits the line.
    assert_eq!(lengths, [2, 2]);
    let labels = texts(&scene);
    for decade in ["100", "101", "102", "103"] {
        assert!(labels.iter().any(|t| t == decade), "{decade} in {labels:?}");
    }
}

/// The legend's text boxes.
fn legend_box(scene: &Scene) -> eyrie::layout::Rect {
    scene
        .texts()
        .filter(|t| t.role == Role::LegendText)
        .map(|t| t.bbox())
        .reduce(|a, b| eyrie::layout::Rect {
            x0: a.x0.min(b.x0),
            y0: a.y0.min(b.y0),
            x1: a.x1.max(b.x1),
            y1: a.y1.max(b.y1),
        })
        .expect("a legend")
}

/// The plot frame: the axis polyline (left edge, bottom edge).
fn plot_area(scene: &Scene) -> (f64, f64, f64, f64) {
    let axis = scene.lines().find(|l| l.role == Role::Axis).unwrap();
    let (x0, y0) = axis.points[0];
    let (x1, y1) = axis.points[2];
    (x0, y0, x1, y1)
}

#[test]
fn legend_takes_the_corner_with_no_data() {
    // A rising diagonal fills the bottom-left and top-right corners; the first
    // free corner in order of preference is top left.
    let rising = ChartSpec {
        series: vec![
            Series {
                name: "rising".into(),
                points: (0..=50).map(|i| (i as f64, 2.0 * i as f64)).collect(),
            },
            Series {
                name: "also rising".into(),
                points: (0..=50).map(|i| (i as f64, 2.0 * i as f64 - 5.0)).collect(),
            },
        ],
        ..ChartSpec::default()
    };
    let scene = layout_chart(&rising, &Style::default());
    let (x0, y0, x1, y1) = plot_area(&scene);
    let b = legend_box(&scene);
    assert!(b.x1 < (x0 + x1) / 2.0 && b.y1 < (y0 + y1) / 2.0, "{b:?}");
    // Falling lines leave the top right free, the first choice.
    let mut falling = rising.clone();
    for s in &mut falling.series {
        for p in &mut s.points {
            p.1 = 100.0 - p.1;
        }
    }
    let scene = layout_chart(&falling, &Style::default());
    let (x0, y0, x1, y1) = plot_area(&scene);
    let b = legend_box(&scene);
    assert!(b.x0 > (x0 + x1) / 2.0 && b.y1 < (y0 + y1) / 2.0, "{b:?}");
}

/// Flat lines at the given heights over an axis from 0 to 100.
fn flat(levels: &[f64]) -> ChartSpec {
    ChartSpec {
        series: levels
            .iter()
            .map(|&y| Series {
                name: format!("at {y}"),
                points: (0..=20).map(|i| (i as f64, y)).collect(),
            })
            .collect(),
        y_include: vec![0.0, 100.0],
        ..ChartSpec::default()
    }
}

#[test]
fn legend_moves_to_an_edge_middle_then_above_the_plot() {
    // Lines near the top and the bottom run through all four corners (lines
    // right on the frame would leave room inside it): the right middle is free.
    let scene = layout_chart(&flat(&[95.0, 5.0]), &Style::default());
    let (x0, y0, x1, y1) = plot_area(&scene);
    let b = legend_box(&scene);
    assert!(
        b.x0 > (x0 + x1) / 2.0 && b.y0 > y0 + (y1 - y0) * 0.2,
        "{b:?}"
    );
    assert!(b.y1 < y1 - (y1 - y0) * 0.2, "{b:?}");
    // A third line through the middle leaves no spot inside: a strip on top.
    let scene = layout_chart(&flat(&[95.0, 50.0, 5.0]), &Style::default());
    let (_, y0, _, _) = plot_area(&scene);
    assert!(legend_box(&scene).y1 < y0);
    assert!(scene.overlapping_texts().is_empty());
}

#[test]
fn empty_and_degenerate_specs_still_draw_axes() {
    for spec in [
        ChartSpec::default(),
        ChartSpec {
            y_scale: AxisScale::Log10,
            series: vec![Series {
                name: "all zero".into(),
                points: vec![(0.0, 0.0), (1.0, 0.0)],
            }],
            ..ChartSpec::default()
        },
        ChartSpec {
            series: vec![Series {
                name: "one point".into(),
                points: vec![(3.0, 3.0)],
            }],
            ..ChartSpec::default()
        },
    ] {
        let scene = layout_chart(&spec, &Style::default());
        assert!(scene.lines().any(|l| l.role == Role::Axis));
        assert!(scene.overlapping_texts().is_empty());
        for item in &scene.items {
            if let Item::Line(l) = item {
                assert!(l.points.iter().all(|p| p.0.is_finite() && p.1.is_finite()));
            }
        }
    }
}

#[test]
fn same_spec_same_bytes_and_escaped_names() {
    let mut spec = crossing();
    spec.series[2].name = "a < b & \"c\"".into();
    let style = Style::default();
    let one = eyrie::render::to_svg(&layout_chart(&spec, &style));
    let two = eyrie::render::to_svg(&layout_chart(&spec, &style));
    assert_eq!(one, two);
    roxmltree::Document::parse(&one).expect("well-formed SVG");
    assert!(one.contains("a &lt; b &amp;"));
    let png1 = eyrie::render::to_png(&layout_chart(&spec, &style), 300.0).unwrap();
    let png2 = eyrie::render::to_png(&layout_chart(&spec, &style), 300.0).unwrap();
    assert_eq!(png1, png2);
}

#[test]
fn png_has_the_requested_pixel_size() {
    let style = Style::preset("article-wide").unwrap();
    let bytes = eyrie::render::to_png(&layout_chart(&decay(), &style), 150.0).unwrap();
    let reader = png::Decoder::new(std::io::Cursor::new(bytes))
        .read_info()
        .expect("a PNG");
    let info = reader.info();
    // 175 × 90 mm at 150 dpi: 175 / 25.4 × 150 = 1033.46 → 1033 px,
    // 90 / 25.4 × 150 = 531.50 (531.496) → 531 px (closed form).
    assert_eq!((info.width, info.height), (1033, 531));
}
