//! The bad-input corpus: every file in `tests/bad_inputs/*.toml` is parsed
//! and its diagnostics, rendered exactly as the CLI prints them, must equal
//! the neighbouring `.expected` file byte for byte.
//!
//! Files named `warn-*.toml` must parse (the expected text is their warnings);
//! every other file must be rejected. To regenerate the expected files after a
//! deliberate change of wording, run with `EYRIE_BLESS=1` and read the diff.

use std::fs;
use std::path::{Path, PathBuf};

use eyrie::diag::Source;

fn corpus() -> Vec<PathBuf> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/bad_inputs");
    let mut files: Vec<PathBuf> = fs::read_dir(&dir)
        .expect("tests/bad_inputs exists")
        .map(|e| e.expect("readable directory entry").path())
        .filter(|p| p.extension().is_some_and(|e| e == "toml"))
        .collect();
    files.sort();
    files
}

/// A line-by-line comparison that shows the first lines that differ.
fn difference(expected: &str, actual: &str) -> String {
    let mut out = String::new();
    let (e, a): (Vec<&str>, Vec<&str>) = (expected.lines().collect(), actual.lines().collect());
    for i in 0..e.len().max(a.len()) {
        let (x, y) = (e.get(i).copied(), a.get(i).copied());
        if x != y {
            out.push_str(&format!(
                "line {}:\n- {}\n+ {}\n",
                i + 1,
                x.unwrap_or("<none>"),
                y.unwrap_or("<none>")
            ));
        }
    }
    if out.is_empty() {
        out.push_str("(only trailing whitespace or final newline differs)\n");
    }
    out
}

#[test]
fn every_bad_input_gives_the_expected_located_messages() {
    let bless = std::env::var_os("EYRIE_BLESS").is_some_and(|v| v == "1");
    let files = corpus();
    assert!(
        files.len() >= 20,
        "the corpus has only {} files",
        files.len()
    );
    let mut failures = Vec::new();
    for path in files {
        let name = path.file_name().unwrap().to_string_lossy().to_string();
        let text = fs::read_to_string(&path).expect("corpus file is UTF-8");
        let result = eyrie::profile::parse(&text);
        let diagnostics = match (&result, name.starts_with("warn-")) {
            (Ok(parsed), true) if !parsed.warnings.is_empty() => parsed.warnings.clone(),
            (Ok(_), true) => {
                failures.push(format!("{name}: expected warnings, got none"));
                continue;
            }
            (Err(d), false) => d.clone(),
            (Ok(_), false) => {
                failures.push(format!(
                    "{name}: expected an error, but the profile was accepted"
                ));
                continue;
            }
            (Err(d), true) => {
                failures.push(format!(
                    "{name}: expected only warnings, got errors:\n{}",
                    Source {
                        name: name.clone(),
                        text: text.clone()
                    }
                    .render(d)
                ));
                continue;
            }
        };
        let rendered = Source {
            name: name.clone(),
            text,
        }
        .render(&diagnostics);
        let expected_path = path.with_extension("expected");
        if bless {
            fs::write(&expected_path, &rendered).expect("write expected file");
            continue;
        }
        match fs::read_to_string(&expected_path) {
            Ok(expected) if expected == rendered => {}
            Ok(expected) => failures.push(format!(
                "{name}: output differs from {}\n{}",
                expected_path.display(),
                difference(&expected, &rendered)
            )),
            Err(_) => failures.push(format!(
                "{name}: no {} (run with EYRIE_BLESS=1)\n{rendered}",
                expected_path.display()
            )),
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}
