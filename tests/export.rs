//! `eyrie export`: the numbers for the manuscript are the ones the tables show,
//! in LaTeX, Markdown and CSV, with keys that survive any path name.

use crate::common;

use common::{eyrie, repo};

#[test]
fn the_exported_numbers_are_the_analysed_ones() {
    let dir = tempfile::tempdir().unwrap();
    let out = eyrie(
        &["export", &repo("profiles/demo.toml"), "-o", "n.csv"],
        dir.path(),
    );
    common::assert_exit(&out, 0);
    let csv = std::fs::read_to_string(dir.path().join("n.csv")).unwrap();
    let json = eyrie(
        &["analyze", &repo("profiles/demo.toml"), "--json"],
        dir.path(),
    );
    let v: serde_json::Value = serde_json::from_slice(&json.stdout).unwrap();
    // The apparent barrier of every path, printed with the one rule (1 decimal, kcal/mol).
    for p in v["paths"].as_array().unwrap() {
        let key = format!("path.{}.barrier,", p["name"].as_str().unwrap());
        let line = csv.lines().find(|l| l.starts_with(&key)).expect(&key);
        let want = format!("{:.1}", p["apparent_barrier"].as_f64().unwrap());
        assert!(
            line.contains(&format!(",{want},kcal/mol")),
            "{line} vs {want}"
        );
    }
    assert!(csv.starts_with("key,quantity,value,unit\n"));
}

#[test]
fn latex_defines_one_macro_per_number_with_safe_keys() {
    let dir = tempfile::tempdir().unwrap();
    let out = eyrie(
        &[
            "export",
            &repo("profiles/entropy-switch.toml"),
            "-o",
            "n.tex",
        ],
        dir.path(),
    );
    common::assert_exit(&out, 0);
    let tex = std::fs::read_to_string(dir.path().join("n.tex")).unwrap();
    assert!(tex.contains("\\providecommand{\\eyrie}[1]{\\csname eyrie@#1\\endcsname}"));
    // "ring closure" has a space: its key uses a dash.
    assert!(
        tex.contains("\\csname eyrie@path.ring-closure.barrier\\endcsname{"),
        "{tex}"
    );
    for line in tex.lines().filter(|l| l.starts_with("\\expandafter")) {
        let code = line.split(" % ").next().unwrap();
        // A power of ten is math; outside math mode LaTeX stops at `^`.
        if code.contains("\\times10^") {
            assert!(code.contains("\\ensuremath{"), "{line}");
        }
        assert_eq!(
            code.matches('{').count(),
            code.matches('}').count(),
            "{line}"
        );
    }
    let out = eyrie(
        &["export", &repo("profiles/demo.toml"), "-o", "n.docx"],
        dir.path(),
    );
    assert_eq!(out.status.code(), Some(2));
}
