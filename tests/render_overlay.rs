//! Variants drawn over their profile (`render --variants`) and the figure
//! settings a profile gives itself (path colour/dash/width, pinned columns,
//! `[figure]` spacing), checked on the scene and through the binary.

use crate::common;

use common::{eyrie, repo, write};
use eyrie::figure::{FigureOptions, diagram_spec};
use eyrie::layout::{Role, Scene, Tag, layout};
use eyrie::model::Model;

fn model(text: &str) -> Model {
    eyrie::profile::parse(text)
        .unwrap_or_else(|e| panic!("does not parse: {e:?}"))
        .model
}

fn example() -> Model {
    model(&std::fs::read_to_string(repo("profiles/hydride-transfer.toml")).unwrap())
}

fn scene(model: &Model, options: &FigureOptions) -> Scene {
    layout(&diagram_spec(model, options), &options.style().unwrap())
}

fn overlaid(model: &Model) -> Scene {
    let options = FigureOptions {
        variants: (0..model.variants().len()).collect(),
        ..FigureOptions::default()
    };
    scene(model, &options)
}

fn tagged<'a>(scene: &'a Scene, tag: &Tag, role: Role) -> Vec<&'a eyrie::layout::Line> {
    scene
        .lines()
        .filter(|l| l.role == role && l.tag.as_ref() == Some(tag))
        .collect()
}

#[test]
fn each_variant_gets_a_legend_entry_and_no_text_overlaps() {
    let m = example();
    for options in [
        FigureOptions::default(),
        FigureOptions::annotated(),
        FigureOptions {
            preset: "article-wide".into(),
            ..FigureOptions::default()
        },
    ] {
        let options = FigureOptions {
            variants: vec![0, 1],
            ..options
        };
        let s = scene(&m, &options);
        let legend: Vec<String> = s
            .texts()
            .filter(|t| t.role == Role::LegendText)
            .flat_map(|t| t.plain_lines())
            .collect();
        assert_eq!(
            legend,
            ["transfer hydrogenation", "4,4-d₂ donor", "with thiourea"]
        );
        assert!(
            s.overlapping_texts().is_empty(),
            "{:?}",
            s.overlapping_texts()
        );
    }
}

#[test]
fn variant_bars_share_the_base_columns_and_only_changed_points_are_drawn() {
    let m = example();
    let s = overlaid(&m);
    // The isotopologue changes the hydride-transfer TS alone; the co-catalyst
    // four points (profile: complex, ts-ht, ion-pair, ts-pt).
    for (tag, ids) in [
        ("4,4-d₂ donor", vec!["ts-ht"]),
        (
            "with thiourea",
            vec!["complex", "ion-pair", "ts-ht", "ts-pt"],
        ),
    ] {
        let tag = Tag::Path(tag.into());
        let bars = tagged(&s, &tag, Role::Bar);
        assert_eq!(bars.len(), ids.len(), "{tag:?}");
        for id in ids {
            let base = tagged(&s, &Tag::Point(id.into()), Role::Bar)[0];
            let ends = |l: &eyrie::layout::Line| (l.points[0].0, l.points[1].0);
            let y = |l: &eyrie::layout::Line| l.points[0].1;
            assert!(
                bars.iter()
                    .any(|b| ends(b) == ends(base) && (y(b) - y(base)).abs() > 0.5),
                "{tag:?} has no bar over '{id}'"
            );
        }
        // Its values in its own colour, one per changed point.
        let values: Vec<_> = s
            .texts()
            .filter(|t| t.role == Role::Value && t.tag.as_ref() == Some(&tag))
            .collect();
        assert_eq!(values.len(), bars.len(), "{tag:?}");
        assert!(values.iter().all(|t| t.colour == bars[0].colour));
        assert!(
            tagged(&s, &tag, Role::Connector)
                .iter()
                .all(|c| c.colour == bars[0].colour && c.dash.is_some())
        );
    }
    // Two variants, two colours, neither the base path's.
    let colour = |name: &str| tagged(&s, &Tag::Path(name.into()), Role::Bar)[0].colour;
    let base = tagged(&s, &Tag::Point("ts-ht".into()), Role::Bar)[0].colour;
    assert_ne!(colour("4,4-d₂ donor"), colour("with thiourea"));
    assert_ne!(colour("4,4-d₂ donor"), base);
    assert_ne!(colour("with thiourea"), base);
}

#[test]
fn a_variant_that_changes_nothing_visible_draws_nothing() {
    // A shift below the printed precision (0.01 kcal/mol at one decimal).
    let text = std::fs::read_to_string(repo("profiles/hydride-transfer.toml"))
        .unwrap()
        .replace(
            "shift = { complex = -1.8, ts-ht = -2.6, ion-pair = -2.2, ts-pt = -1.0 }",
            "shift = { ts-pt = 0.01 }",
        );
    let s = overlaid(&model(&text));
    assert!(tagged(&s, &Tag::Path("with thiourea".into()), Role::Bar).is_empty());
    assert!(tagged(&s, &Tag::Path("with thiourea".into()), Role::Connector).is_empty());
}

#[test]
fn overlay_through_the_binary_names_every_variant_and_is_deterministic() {
    let dir = tempfile::tempdir().unwrap();
    let profile = repo("profiles/hydride-transfer.toml");
    let run = |out: &str| {
        let o = eyrie(
            &["render", &profile, "-o", out, "--variants", "all"],
            dir.path(),
        );
        assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
        std::fs::read_to_string(dir.path().join(out)).unwrap()
    };
    let a = run("a.svg");
    assert!(a.contains("4,4-d₂ donor") && a.contains("with thiourea"));
    assert_eq!(a, run("b.svg"));
    // One variant by name: the other is absent.
    let o = eyrie(
        &["render", &profile, "-o", "d.svg", "--variants", "D"],
        dir.path(),
    );
    assert!(o.status.success());
    let d = std::fs::read_to_string(dir.path().join("d.svg")).unwrap();
    assert!(d.contains("4,4-d₂ donor") && !d.contains("with thiourea"));
}

#[test]
fn an_unknown_variant_is_a_usage_error_and_writes_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let profile = repo("profiles/hydride-transfer.toml");
    let o = eyrie(
        &["render", &profile, "-o", "x.svg", "--variants", "D,T"],
        dir.path(),
    );
    assert_eq!(o.status.code(), Some(2));
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(
        err.contains("unknown variant 'T' in --variants: the profile's variants are D, thiourea"),
        "{err}"
    );
    assert!(!dir.path().join("x.svg").exists());
    // A profile without variants: "all" draws it alone, with a note.
    let o = eyrie(
        &[
            "render",
            &repo("profiles/demo.toml"),
            "-o",
            "y.svg",
            "--variants",
            "all",
        ],
        dir.path(),
    );
    assert!(o.status.success());
    assert!(String::from_utf8_lossy(&o.stderr).contains("has no [[variant]]"));
}

const HINTED: &str = r##"
unit = "kcal/mol"
[states]
a = 0.0
b = { g = 3.0, column = 5 }
c = -6.0
[ts]
t1 = 15.0
t2 = 12.0
[[path]]
name = "one"
via = ["a", "t1", "b", "t2", "c"]
colour = "#123456"
dash = "solid"
width = "1.5 pt"
"##;

#[test]
fn path_colour_dash_and_width_from_the_profile_are_drawn() {
    let s = scene(&model(HINTED), &FigureOptions::default());
    let connectors: Vec<_> = s.lines().filter(|l| l.role == Role::Connector).collect();
    assert_eq!(connectors.len(), 4);
    for c in &connectors {
        assert_eq!((c.colour.r, c.colour.g, c.colour.b), (0x12, 0x34, 0x56));
        assert_eq!(c.dash, None); // solid
        assert_eq!(c.width_pt, 1.5);
    }
    let svg = eyrie::render::to_svg(&s);
    assert!(svg.contains("#123456"));
}

#[test]
fn a_pinned_column_moves_the_point_and_keeps_the_order() {
    let x = |text: &str, id: &str| {
        let s = scene(&model(text), &FigureOptions::default());
        let bar = tagged(&s, &Tag::Point(id.into()), Role::Bar)[0];
        (bar.points[0].0 + bar.points[1].0) / 2.0
    };
    let free = HINTED.replace(", column = 5", "");
    // Unpinned: five columns, b in the middle one. Pinned to column 5 of 7
    // (c follows two columns later): b moves right of the page centre.
    assert!(x(HINTED, "b") > x(&free, "b") + 5.0);
    let order: Vec<f64> = ["a", "t1", "b", "t2", "c"]
        .iter()
        .map(|id| x(HINTED, id))
        .collect();
    assert!(order.windows(2).all(|w| w[0] < w[1]), "{order:?}");
}

#[test]
fn spacing_sets_the_gap_between_bars() {
    let bar = |text: &str| {
        let s = scene(&model(text), &FigureOptions::default());
        let b = tagged(&s, &Tag::Point("a".into()), Role::Bar)[0];
        b.points[1].0 - b.points[0].0
    };
    let free = HINTED.replace(", column = 5", "");
    let wide = bar(&format!("{free}\n[figure]\nspacing = 0.25\n"));
    let narrow = bar(&format!("{free}\n[figure]\nspacing = 3\n"));
    // Same column width, bar = column / (1 + spacing): ratio (1 + 3) / (1 + 0.25).
    assert!((wide / narrow - 4.0 / 1.25).abs() < 1e-9, "{wide} {narrow}");
    let fixed = bar(&format!("{free}\n[figure]\nbar_width = \"3 mm\"\n"));
    assert!((fixed - 3.0).abs() < 1e-9);
}

#[test]
fn scratch_profile_with_hints_renders_through_the_binary() {
    let dir = tempfile::tempdir().unwrap();
    let p = write(dir.path(), "h.toml", HINTED);
    let o = eyrie(&["render", p.to_str().unwrap(), "-o", "h.svg"], dir.path());
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
}
