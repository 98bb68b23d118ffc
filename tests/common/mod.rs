//! Helpers shared by the tests that run the `eyrie` binary as a user would:
//! run it in a folder, find repository files, write scratch profiles.
#![allow(dead_code)] // not every helper is used by every module

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// RT at 298.15 K in kcal/mol (CODATA 2018; tests/reference/constants.toml).
pub const RT_298_KCAL: f64 = 0.592484949713764;

/// One reactant, two products: a single reacting state, so the predicted ratio
/// pb:pa is exp(ΔΔG‡/RT) with ΔΔG‡ = 19.4 − 18.1 = 1.3 kcal/mol (closed form).
pub const PAIR: &str = r#"unit = "kcal/mol"
temperature = 298.15
[states]
r = 0.0
pa = -8.0
pb = -7.0
[ts]
ts-a = 19.4
ts-b = 18.1
[[path]]
name = "to b"
via = ["r", "ts-b", "pb"]
[[path]]
name = "to a"
via = ["r", "ts-a", "pa"]
"#;

/// Runs `eyrie ARGS` with `dir` as the working folder.
pub fn eyrie(args: &[&str], dir: &Path) -> Output {
    Command::new(env!("CARGO_BIN_EXE_eyrie"))
        .args(args)
        .current_dir(dir)
        .output()
        .expect("the binary runs")
}

/// Asserts the run ended with exit code `code`, showing what it printed if not.
pub fn assert_exit(out: &Output, code: i32) {
    assert_eq!(
        out.status.code(),
        Some(code),
        "stdout:\n{}\nstderr:\n{}",
        String::from_utf8_lossy(&out.stdout),
        String::from_utf8_lossy(&out.stderr)
    );
}

/// A path inside the repository, as a string for the command line.
pub fn repo(path: &str) -> String {
    format!("{}/{path}", env!("CARGO_MANIFEST_DIR"))
}

/// Writes `content` to `dir/name` and returns the path.
pub fn write(dir: &Path, name: &str, content: &str) -> PathBuf {
    let p = dir.join(name);
    std::fs::write(&p, content).unwrap();
    p
}

/// One of the check-value files in `tests/reference/` (written by
/// `tests/reference/generate.py`), as a TOML table.
pub fn reference_table(file: &str) -> toml::Table {
    let path = repo(&format!("tests/reference/{file}"));
    std::fs::read_to_string(path).unwrap().parse().unwrap()
}

/// One `[[check]]` entry of a reference file: the value, its tolerance and
/// the inputs it was computed from.
pub struct Check {
    pub id: String,
    pub value: f64,
    pub rel: f64,
    pub abs: f64,
    pub inputs: toml::Table,
}

impl Check {
    /// A numeric input of the entry.
    pub fn input(&self, key: &str) -> f64 {
        self.inputs[key].as_float().unwrap()
    }

    /// Asserts `got` is within the entry's tolerance: the larger of
    /// `rel × |value|` and `abs`.
    pub fn assert_close(&self, got: f64) {
        let allowed = (self.rel * self.value.abs()).max(self.abs);
        assert!(
            (got - self.value).abs() <= allowed,
            "{}: got {got:e}, reference {:e} (allowed ±{allowed:e})",
            self.id,
            self.value
        );
    }
}

/// The `[[check]]` entries of a reference table, each held to the first of
/// `tolerance_keys` it has (integrated values carry a looser `tolerance_ode`).
pub fn reference_checks(doc: &toml::Table, tolerance_keys: &[&str]) -> Vec<Check> {
    doc["check"]
        .as_array()
        .expect("[[check]] tables")
        .iter()
        .map(|c| {
            let tol = tolerance_keys
                .iter()
                .find_map(|k| c.get(*k))
                .and_then(|t| t.as_table())
                .expect("a tolerance table");
            let f = |k: &str| tol.get(k).and_then(|v| v.as_float()).unwrap_or(0.0);
            Check {
                id: c["id"].as_str().unwrap().to_string(),
                value: c
                    .get("value")
                    .and_then(|v| v.as_float())
                    .unwrap_or(f64::NAN),
                rel: f("rel"),
                abs: f("abs"),
                inputs: c["inputs"].as_table().cloned().unwrap_or_default(),
            }
        })
        .collect()
}

/// A TOML array of numbers.
pub fn floats(v: &toml::Value) -> Vec<f64> {
    v.as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_float().unwrap())
        .collect()
}

/// An SVG written by eyrie read by usvg (an independent SVG reader) with only
/// the bundled faces loaded, so tests can check eyrie's SVG, PNG and PDF
/// against what another renderer makes of the same figure.
pub fn usvg_tree(svg: &str) -> resvg::usvg::Tree {
    use resvg::usvg;
    use std::sync::Arc;
    let mut db = usvg::fontdb::Database::new();
    for face in [eyrie::font::REGULAR, eyrie::font::ITALIC] {
        db.load_font_source(usvg::fontdb::Source::Binary(Arc::new(face)));
    }
    db.set_sans_serif_family(eyrie::font::FAMILY);
    let options = usvg::Options {
        font_family: eyrie::font::FAMILY.to_string(),
        fontdb: Arc::new(db),
        ..usvg::Options::default()
    };
    usvg::Tree::from_str(svg, &options).expect("eyrie's SVG parses")
}

/// The extra `render` arguments `gallery/regenerate.sh` gives profile `name`
/// (the `extra=(...)` of its case), read from the script itself so tests draw
/// exactly what the gallery shows.
pub fn gallery_args(name: &str) -> Vec<String> {
    let script = std::fs::read_to_string(repo("gallery/regenerate.sh")).unwrap();
    for line in script.lines() {
        let Some((patterns, rest)) = line.trim().split_once(") extra=(") else {
            continue;
        };
        if patterns.split('|').any(|p| p == name || p == "*") {
            let inner = rest.split_once(')').unwrap().0;
            return inner.split_whitespace().map(String::from).collect();
        }
    }
    panic!("{name}: no case in gallery/regenerate.sh")
}

/// Every profile in `profiles/`, by name in file-name order, with the
/// arguments the gallery draws it with.
pub fn gallery_cases() -> Vec<(String, Vec<String>)> {
    let mut names: Vec<String> = std::fs::read_dir(repo("profiles"))
        .unwrap()
        .filter_map(|e| {
            let path = e.unwrap().path();
            (path.extension()? == "toml")
                .then(|| path.file_stem().unwrap().to_string_lossy().into_owned())
        })
        .collect();
    names.sort();
    names
        .into_iter()
        .map(|n| {
            let args = gallery_args(&n);
            (n, args)
        })
        .collect()
}
