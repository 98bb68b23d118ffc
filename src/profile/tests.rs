//! Unit tests of the profile stage: the model built from valid text, and the
//! rules each check enforces (one test per rule, each able to fail).

use super::parse;
use crate::diag::Diagnostic;
use crate::model::{Kind, Model, Step};
use crate::units::EnergyUnit;

fn model(text: &str) -> Model {
    match parse(text) {
        Ok(parsed) => parsed.model,
        Err(errors) => panic!("expected a valid profile, got {errors:#?}"),
    }
}

fn errors(text: &str) -> Vec<Diagnostic> {
    match parse(text) {
        Ok(parsed) => panic!("expected errors, got a model {:#?}", parsed.model),
        Err(errors) => errors.into_iter().filter(|d| d.is_error()).collect(),
    }
}

fn warnings(text: &str) -> Vec<Diagnostic> {
    match parse(text) {
        Ok(parsed) => parsed.warnings,
        Err(errors) => panic!("expected only warnings, got {errors:#?}"),
    }
}

fn id(m: &Model, name: &str) -> usize {
    m.find(name).unwrap_or_else(|| panic!("no point '{name}'"))
}

fn step(m: &Model, from: &str, ts: Option<&str>, to: &str) -> Step {
    Step {
        from: id(m, from),
        ts: ts.map(|t| id(m, t)),
        to: id(m, to),
    }
}

const LINEAR: &str = r#"
unit = "kcal/mol"
[states]
a = 0.0
b = -3.0
c = { g = -9.5, label = "final" }
[ts]
ts-ab = 15.0
ts-bc = { g = 12.0, label = "TS-2" }
[[path]]
via = ["a", "ts-ab", "b", "ts-bc", "c"]
"#;

#[test]
fn shipped_profiles_parse_without_errors_or_warnings() {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("profiles");
    let mut count = 0;
    for entry in std::fs::read_dir(dir).expect("profiles/ exists") {
        let path = entry.expect("entry").path();
        if path.extension().is_none_or(|e| e != "toml") {
            continue;
        }
        let text = std::fs::read_to_string(&path).expect("readable");
        match parse(&text) {
            Ok(parsed) => assert!(
                parsed.warnings.is_empty(),
                "{}: {:#?}",
                path.display(),
                parsed.warnings
            ),
            Err(e) => panic!("{}: {e:#?}", path.display()),
        }
        count += 1;
    }
    assert!(count >= 3, "expected the demo and at least two examples");
}

#[test]
fn shorthand_tables_labels_and_defaults() {
    let m = model(LINEAR);
    assert_eq!(m.unit(), EnergyUnit::KcalPerMol);
    assert_eq!(m.title(), None);
    assert_eq!(m.zero(), None);
    // Default temperature: 298.15 K exactly.
    assert_eq!(m.temperature().k(), 298.15);
    let ids: Vec<&str> = m.points().iter().map(|p| p.id.as_str()).collect();
    assert_eq!(ids, ["a", "b", "c", "ts-ab", "ts-bc"]);
    assert_eq!(
        m.point(id(&m, "b")).label,
        "b",
        "a bare number takes the id as label"
    );
    assert_eq!(m.point(id(&m, "c")).label, "final");
    assert_eq!(m.point(id(&m, "ts-bc")).label, "TS-2");
    assert_eq!(m.point(id(&m, "ts-bc")).kind, Kind::TransitionState);
    assert_eq!(m.point(id(&m, "c")).g, -9.5, "no zero: energies as written");
    assert_eq!(m.paths()[0].name, "path 1");
    assert_eq!(
        m.steps(),
        [
            step(&m, "a", Some("ts-ab"), "b"),
            step(&m, "b", Some("ts-bc"), "c")
        ]
    );
    assert_eq!(m.products().collect::<Vec<_>>(), [id(&m, "c")]);
}

#[test]
fn states_come_before_transition_states_whatever_the_table_order() {
    let m = model(
        r#"
unit = "kJ/mol"
[ts]
t2 = 50.0
t1 = 40.0
[states]
z = 0.0
y = 5.0
x = 1.0
[[path]]
via = ["z", "t2", "y", "t1", "x"]
"#,
    );
    let ids: Vec<&str> = m.points().iter().map(|p| p.id.as_str()).collect();
    assert_eq!(
        ids,
        ["z", "y", "x", "t2", "t1"],
        "file order within each kind, not alphabetical"
    );
}

#[test]
fn zero_shifts_every_energy() {
    let m = model(&LINEAR.replace("unit = ", "zero = \"b\"\nunit = "));
    assert_eq!(m.zero(), Some(id(&m, "b")));
    let g = |n: &str| m.point(id(&m, n)).g;
    assert_eq!(g("b"), 0.0);
    assert_eq!(g("a"), 3.0);
    assert_eq!(g("ts-ab"), 18.0);
    assert_eq!(g("c"), -6.5);
}

#[test]
fn absolute_hartree_energies_become_relative_with_zero() {
    let text = std::fs::read_to_string(
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("profiles/hartree-absolute.toml"),
    )
    .expect("example exists");
    let parsed = parse(&text).expect("valid");
    let m = parsed.model;
    assert!(parsed.warnings.is_empty());
    assert_eq!(m.unit(), EnergyUnit::Hartree);
    let ts = m.point(id(&m, "ts")).g;
    let pc = m.point(id(&m, "pc")).g;
    // Differences of the absolute values in the file, in hartree.
    assert!((ts - 0.030685).abs() < 1e-9, "{ts}");
    assert!((pc - -0.022508).abs() < 1e-9, "{pc}");
    // closed form: unit conversion, CODATA 2018 hartree (2625.499639 kJ/mol),
    // thermochemical calorie 4.184 J: 0.030685 × 2625.499639 / 4.184.
    let ts_kcal = m.unit().convert(ts, EnergyUnit::KcalPerMol);
    let pc_kcal = m.unit().convert(pc, EnergyUnit::KcalPerMol);
    assert!((ts_kcal - 19.255128208).abs() < 1e-6, "{ts_kcal}");
    assert!((pc_kcal - -14.123983240).abs() < 1e-6, "{pc_kcal}");
}

#[test]
fn absolute_hartree_without_zero_warns_and_relative_hartree_does_not() {
    let absolute = r#"
unit = "hartree"
[states]
rc = -842.315604
pc = -842.338112
[ts]
ts = -842.284919
[[path]]
via = ["rc", "ts", "pc"]
"#;
    let w = warnings(absolute);
    assert_eq!(w.len(), 1);
    assert!(w[0].message.contains("look absolute"));
    assert_eq!(
        w[0].help.as_deref(),
        Some("set zero = \"rc\" to show and report energies relative to that state")
    );
    let relative = absolute
        .replace("-842.315604", "0.0")
        .replace("-842.338112", "-0.0225")
        .replace("-842.284919", "0.0307");
    assert!(warnings(&relative).is_empty());
}

#[test]
fn temperatures_in_kelvin_and_celsius() {
    for (written, kelvin) in [
        ("temperature = 350", 350.0),
        ("temperature = \"80 C\"", 353.15),
        ("temperature = \"-78 C\"", 195.15),
        ("temperature = \"298.15 K\"", 298.15),
    ] {
        let m = model(&format!("{written}\n{LINEAR}"));
        assert!((m.temperature().k() - kelvin).abs() < 1e-9, "{written}");
    }
    for bad in [
        "temperature = 0",
        "temperature = -5.0",
        "temperature = \"-300 C\"",
        "temperature = \"warm\"",
        "temperature = true",
    ] {
        let e = errors(&format!("{bad}\n{LINEAR}"));
        assert_eq!(e.len(), 1, "{bad}: {e:#?}");
        assert_eq!(
            e[0].span.start,
            "temperature = ".len(),
            "{bad}: points at the value"
        );
    }
}

#[test]
fn unit_spellings_are_forgiven_but_unknown_units_are_not() {
    for (written, unit) in [
        ("kJ/mol", EnergyUnit::KjPerMol),
        ("eV", EnergyUnit::Ev),
        ("Hartree", EnergyUnit::Hartree),
        ("kcal mol-1", EnergyUnit::KcalPerMol),
    ] {
        // Small numbers so the plausibility check holds in every unit.
        let text = LINEAR
            .replace("kcal/mol", written)
            .replace("15.0", "0.5")
            .replace("12.0", "0.4")
            .replace("-9.5", "-0.2")
            .replace("-3.0", "-0.1");
        assert_eq!(model(&text).unit(), unit, "{written}");
    }
    let e = errors(&LINEAR.replace("kcal/mol", "kcal/mole"));
    assert_eq!(e.len(), 1);
    assert!(
        e[0].help
            .as_deref()
            .unwrap_or("")
            .contains("did you mean 'kcal/mol'?")
    );
}

#[test]
fn steps_are_deduplicated_in_either_direction_in_order_of_first_appearance() {
    let m = model(
        r#"
unit = "kcal/mol"
[states]
a = 0.0
b = 2.0
c = -5.0
d = -8.0
[ts]
t1 = 10.0
t2 = 12.0
[[path]]
name = "there"
via = ["a", "t1", "b", "t2", "c"]
[[path]]
name = "back"
via = ["c", "t2", "b", "t1", "a"]
[[path]]
name = "branch"
via = ["b", "t2", "c", "d"]
"#,
    );
    assert_eq!(
        m.steps(),
        [
            step(&m, "a", Some("t1"), "b"),
            step(&m, "b", Some("t2"), "c"),
            step(&m, "c", None, "d"),
        ]
    );
    let names: Vec<&str> = m.paths().iter().map(|p| p.name.as_str()).collect();
    assert_eq!(names, ["there", "back", "branch"]);
}

#[test]
fn barrierless_steps_and_a_different_ts_for_the_same_pair_are_distinct_steps() {
    let m = model(
        r#"
unit = "kcal/mol"
[states]
a = 0.0
b = -1.0
[ts]
t1 = 10.0
t2 = 11.0
[[path]]
via = ["a", "t1", "b"]
[[path]]
via = ["a", "t2", "b"]
[[path]]
via = ["a", "b"]
"#,
    );
    assert_eq!(
        m.steps(),
        [
            step(&m, "a", Some("t1"), "b"),
            step(&m, "a", Some("t2"), "b"),
            step(&m, "a", None, "b")
        ]
    );
}

#[test]
fn products_are_inferred_from_path_ends_and_can_be_overridden() {
    // c ends a path and starts none; b ends "first" but starts "second".
    let text = r#"
unit = "kcal/mol"
[states]
a = 0.0
b = { g = -2.0 }
c = { g = -4.0 }
[ts]
t1 = 10.0
t2 = 11.0
[[path]]
name = "first"
via = ["a", "t1", "b"]
[[path]]
name = "second"
via = ["b", "t2", "c"]
"#;
    let m = model(text);
    assert_eq!(m.products().collect::<Vec<_>>(), [id(&m, "c")]);
    let m = model(
        &text
            .replace("b = { g = -2.0 }", "b = { g = -2.0, product = true }")
            .replace("c = { g = -4.0 }", "c = { g = -4.0, product = false }"),
    );
    assert_eq!(m.products().collect::<Vec<_>>(), [id(&m, "b")]);
}

#[test]
fn a_ts_may_be_walked_both_ways_but_not_between_other_minima() {
    let ok = r#"
unit = "kcal/mol"
[states]
a = 0.0
b = 1.0
c = -3.0
[ts]
t = 9.0
u = 12.0
[[path]]
via = ["a", "t", "b"]
[[path]]
via = ["b", "t", "a", "u", "c"]
"#;
    model(ok);
    let e = errors(&ok.replace(r#"["b", "t", "a", "u", "c"]"#, r#"["b", "t", "c"]"#));
    assert_eq!(e.len(), 1);
    assert!(
        e[0].message
            .contains("joins 'b' and 'c' here, but 'a' and 'b' elsewhere"),
        "{}",
        e[0].message
    );
    assert_eq!(e[0].related.len(), 1);
}

#[test]
fn every_error_is_collected_and_sorted_by_position() {
    let text = r#"
titel = "typo"
unit = "furlongs"
[states]
a = nan
b = { g = 1.0, colour = "red" }
[ts]
t = "high"
[[path]]
via = ["a", "t", "x"]
"#;
    let e = errors(text);
    let starts: Vec<usize> = e.iter().map(|d| d.span.start).collect();
    let mut sorted = starts.clone();
    sorted.sort();
    assert_eq!(starts, sorted);
    let found = |needle: &str| e.iter().any(|d| d.message.contains(needle));
    for needle in [
        "unknown key 'titel'",
        "unknown energy unit 'furlongs'",
        "not a finite number",
        "unknown key 'colour'",
        "must be a number or a table",
        "unknown id 'x'",
    ] {
        assert!(found(needle), "missing {needle:?} in {e:#?}");
    }
    for d in &e {
        assert!(d.span.end <= text.len());
        assert!(
            !text[d.span.clone()].is_empty(),
            "{d:?} underlines something"
        );
    }
}

#[test]
fn the_most_specific_token_is_underlined() {
    let text = LINEAR.replace(
        r#"["a", "ts-ab", "b", "ts-bc", "c"]"#,
        r#"["a", "ts-ab", "b", "ts-bd", "c"]"#,
    );
    let e = errors(&text);
    assert_eq!(e.len(), 1);
    assert_eq!(&text[e[0].span.clone()], "\"ts-bd\"");
    assert_eq!(e[0].help.as_deref(), Some("did you mean 'ts-bc'?"));
}

#[test]
fn absurd_energies_are_refused_at_the_threshold() {
    // 1000 kcal/mol from the reference is the limit; kJ/mol converts first.
    let base = |g: &str, unit: &str| {
        format!(
            "unit = \"{unit}\"\n[states]\na = 0.0\nb = {g}\n[ts]\nt = 1.0\n[[path]]\nvia = [\"a\", \"t\", \"b\"]\n"
        )
    };
    assert!(parse(&base("-999.0", "kcal/mol")).is_ok());
    assert_eq!(errors(&base("-1001.0", "kcal/mol")).len(), 1);
    assert!(parse(&base("-4180.0", "kJ/mol")).is_ok(), "999.04 kcal/mol");
    assert_eq!(
        errors(&base("-4190.0", "kJ/mol")).len(),
        1,
        "1001.4 kcal/mol"
    );
    // Measured from zero when given: here b is the reference, a is far away.
    let e = errors(&base("-2000.0", "kcal/mol").replace("unit =", "zero = \"b\"\nunit ="));
    assert_eq!(e.len(), 2, "a and t are far from b: {e:#?}");
}

#[test]
fn ts_below_a_minimum_warns_with_the_gap_in_the_file_unit() {
    let w = warnings(&LINEAR.replace("ts-bc = { g = 12.0", "ts-bc = { g = -4.25"));
    assert_eq!(w.len(), 1, "{w:#?}");
    // -3.0 - -4.25 = 1.25 → shown with one decimal in kcal/mol ("1.2" or "1.3" by rounding of 1.25).
    assert!(
        w[0].message
            .starts_with("transition state 'ts-bc' lies 1.2"),
        "{}",
        w[0].message
    );
    assert!(
        w[0].message
            .ends_with("kcal/mol below 'b', a minimum it connects")
    );
}

#[test]
fn unused_points_and_missing_products_warn() {
    let w = warnings(&LINEAR.replace("[ts]", "lonely = 4.0\n[ts]"));
    assert_eq!(w.len(), 1);
    assert_eq!(w[0].message, "state 'lonely' is on no path");
    let w = warnings(&LINEAR.replace(
        "c = { g = -9.5, label = \"final\" }",
        "c = { g = -9.5, product = false }",
    ));
    assert_eq!(w.len(), 1);
    assert!(w[0].message.starts_with("no state is a product"));
}

#[test]
fn figure_keys_reach_the_model_as_hints() {
    use crate::model::Dash;
    let text = LINEAR
        .replace("b = -3.0", "b = { g = -3.0, column = 4 }")
        .replace(
            "[[path]]\nvia",
            "[figure]\nspacing = 1.5\nbar_width = \"8 mm\"\n[[path]]\ncolor = \"#07B\"\ndash = \"Dash_Dot\"\nwidth = \"1.2 pt\"\nvia",
        );
    let m = model(&text);
    let h = m.figure_hints();
    assert_eq!(h.column(id(&m, "b")), Some(3)); // written 1-based
    assert_eq!(h.column(id(&m, "a")), None);
    assert_eq!(h.spacing, Some(1.5));
    assert_eq!(h.bar_width_mm, Some(8.0));
    let p = h.path(0);
    assert_eq!(p.colour, Some(0x0077BB));
    assert_eq!(p.dash, Some(Dash::DashDot));
    assert_eq!(p.width_pt, Some(1.2));
}

#[test]
fn bad_figure_values_are_located_errors() {
    let text = LINEAR.replace(
        "[[path]]\nvia",
        "[[path]]\ncolour = \"blue\"\ndash = \"dashd\"\nwidth = 40\nvia",
    );
    let e = errors(&text);
    let messages: Vec<&str> = e.iter().map(|d| d.message.as_str()).collect();
    assert_eq!(
        messages,
        [
            "cannot read the colour 'blue'",
            "unknown dash pattern 'dashd'",
            "the line width is 40 pt, outside 0.1–6 pt",
        ]
    );
    assert!(
        e[1].help
            .as_deref()
            .unwrap()
            .contains("did you mean 'dashed'?")
    );
}

#[test]
fn pins_must_increase_along_the_paths() {
    // c after b after a: c pinned left of a.
    let text = LINEAR
        .replace("a = 0.0", "a = { g = 0.0, column = 3 }")
        .replace("label = \"final\"", "label = \"final\", column = 2");
    let e = errors(&text);
    assert_eq!(e.len(), 1, "{e:#?}");
    assert_eq!(
        e[0].message,
        "'c' is pinned to column 2, but it comes after 'a' (column 3) on a path"
    );
    // Equal columns conflict too; increasing ones do not.
    assert_eq!(errors(&text.replace("column = 2", "column = 3")).len(), 1);
    model(&text.replace("column = 2", "column = 5"));
    // Nothing can stand left of column 1.
    let e = errors(&LINEAR.replace("b = -3.0", "b = { g = -3.0, column = 1 }"));
    assert_eq!(
        e[0].message,
        "'b' is pinned to column 1, but 'ts-ab' comes before it on a path"
    );
}
