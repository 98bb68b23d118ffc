//! Helpers shared by the tests that run the `eyrie` binary as a user would:
//! run it in a folder, find repository files, write scratch profiles.
#![allow(dead_code)] // not every helper is used by every module

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// Runs `eyrie ARGS` with `dir` as the working folder.
pub fn eyrie(args: &[&str], dir: &Path) -> Output {
    Command::new(env!("CARGO_BIN_EXE_eyrie"))
        .args(args)
        .current_dir(dir)
        .output()
        .expect("the binary runs")
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

/// A TOML array of numbers.
pub fn floats(v: &toml::Value) -> Vec<f64> {
    v.as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_float().unwrap())
        .collect()
}
