//! `eyrie check`: measured values against the barriers' predictions, on
//! analytic cases, with the documented exit codes (0 all consistent, 1 any
//! inconsistent, 2 invalid input; the worst code wins over several files).

use crate::common;

use common::{PAIR, RT_298_KCAL as RT, eyrie, write};
use std::path::Path;
use std::process::Output;

/// Writes `text` to `dir/name` and runs `eyrie check` on it.
fn check(dir: &Path, name: &str, text: &str, json: bool) -> Output {
    let path = write(dir, name, text);
    let mut args = vec!["check", path.to_str().unwrap()];
    if json {
        args.push("--json");
    }
    eyrie(&args, dir)
}

fn json(out: &Output) -> serde_json::Value {
    serde_json::from_slice(&out.stdout).expect("stdout is JSON")
}

#[test]
fn a_ratio_within_tolerance_is_consistent_and_outside_it_is_not() {
    let dir = tempfile::tempdir().unwrap();
    let obs = "[[observed]]\nkind = \"ratio\"\nproducts = [\"pb\", \"pa\"]\nvalue = 4.0\n";
    let out = check(
        dir.path(),
        "ok.toml",
        &format!("{PAIR}{obs}tolerance = 1.0\n"),
        true,
    );
    common::assert_exit(&out, 0);
    let v = json(&out);
    let e = &v[0];
    assert_eq!(e["kind"], "ratio");
    assert_eq!(e["consistent"], true);
    let predicted = (1.3 / RT).exp();
    assert!((e["predicted"].as_f64().unwrap() / predicted - 1.0).abs() < 1e-9);
    assert_eq!(e["observed"].as_f64().unwrap(), 4.0);
    // closed form: error = RT·ln(r_pred / r_obs) = 1.3 − RT·ln 4.
    let want = 1.3 - RT * 4f64.ln();
    assert!((e["energy_error"].as_f64().unwrap() - want).abs() < 1e-9);
    assert!(e["file"].as_str().unwrap().ends_with("ok.toml"));

    let out = check(
        dir.path(),
        "tight.toml",
        &format!("{PAIR}{obs}tolerance = 0.3\n"),
        false,
    );
    assert_eq!(out.status.code(), Some(1));
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("INCONSISTENT") && text.contains("ΔΔG‡"),
        "{text}"
    );
}

#[test]
fn the_measurement_uncertainty_widens_what_counts_as_consistent() {
    // Observed 2 ± 2.5: the interval reaches the predicted 8.96:1 only with the
    // tolerance: RT·ln(8.96/4.5) = 0.41 kcal/mol (closed form).
    let dir = tempfile::tempdir().unwrap();
    let out = check(
        dir.path(),
        "u.toml",
        &format!(
            "{PAIR}[[observed]]\nkind = \"ratio\"\nproducts = [\"pb\", \"pa\"]\nvalue = 2.0\nuncertainty = 2.5\ntolerance = 0.5\n"
        ),
        true,
    );
    common::assert_exit(&out, 0);
    let text = format!(
        "{PAIR}[[observed]]\nkind = \"ratio\"\nproducts = [\"pb\", \"pa\"]\nvalue = 2.0\ntolerance = 0.5\n"
    );
    assert_eq!(
        check(dir.path(), "v.toml", &text, false).status.code(),
        Some(1)
    );
}

#[test]
fn ee_rate_and_half_life_compare_as_energies() {
    // closed form: k = (kB·T/h)·exp(−ΔG‡/RT) (Eyring 1935, CODATA 2018); the path "to b"
    // has ΔG‡ = 18.1, so a measured k for 19.1 kcal/mol means the prediction is 1.0 low.
    let (kb, h) = (1.380649e-23, 6.62607015e-34);
    let k = |dg: f64| kb * 298.15 / h * (-dg / RT).exp();
    let half_life = std::f64::consts::LN_2 / k(18.6);
    let ee = 100.0 * (4.0 - 1.0) / (4.0 + 1.0); // a 4:1 ratio as ee
    let text = format!(
        "{PAIR}[[observed]]\nkind = \"rate\"\npath = \"to b\"\nvalue = {:e}\ntolerance = 0.5\n\
         [[observed]]\nkind = \"half-life\"\nts = \"ts-b\"\nvalue = \"{} s\"\ntolerance = 0.6\n\
         [[observed]]\nkind = \"ee\"\nproducts = [\"pb\", \"pa\"]\nvalue = {ee}\n",
        k(19.1),
        half_life
    );
    let dir = tempfile::tempdir().unwrap();
    let p = write(dir.path(), "k.toml", &text);
    let out = eyrie(&["check", p.to_str().unwrap(), "--json"], dir.path());
    assert_eq!(
        out.status.code(),
        Some(1),
        "the rate is 1.0 kcal/mol off, beyond 0.5"
    );
    let v = json(&out);
    assert!((v[0]["energy_error"].as_f64().unwrap() + 1.0).abs() < 1e-9);
    assert_eq!(v[0]["consistent"], false);
    assert!((v[1]["energy_error"].as_f64().unwrap() + 0.5).abs() < 1e-6);
    assert_eq!(v[1]["consistent"], true);
    // ee 60 % is the 4:1 ratio: the same error as the ratio test above.
    assert!((v[2]["energy_error"].as_f64().unwrap() - (1.3 - RT * 4f64.ln())).abs() < 1e-9);
}

#[test]
fn a_measured_tof_is_compared_with_the_energetic_span_tof() {
    let profile = std::fs::read_to_string(format!(
        "{}/profiles/catalytic-cycle.toml",
        env!("CARGO_MANIFEST_DIR")
    ))
    .unwrap();
    let dir = tempfile::tempdir().unwrap();
    let out = check(
        dir.path(),
        "c.toml",
        &format!(
            "{profile}\n[[observed]]\nkind = \"tof\"\ncycle = \"turnover\"\nvalue = 1.5e-5\ntolerance = 1.0\n"
        ),
        true,
    );
    common::assert_exit(&out, 0);
    let v = json(&out);
    assert_eq!(v[0]["unit"], "kJ/mol");
    let predicted = v[0]["predicted"].as_f64().unwrap();
    // closed form: error = RT·ln(TOF_obs / TOF_pred), RT in kJ/mol at 298.15 K.
    let rt_kj = 2.47895702960239;
    let want = rt_kj * (1.5e-5 / predicted).ln();
    assert!((v[0]["energy_error"].as_f64().unwrap() - want).abs() < 1e-9);
}

#[test]
fn several_files_report_the_bad_one_and_exit_with_the_worst_code() {
    let dir = tempfile::tempdir().unwrap();
    let obs = "[[observed]]\nkind = \"ratio\"\nproducts = [\"pb\", \"pa\"]\nvalue = 4.0\n";
    write(dir.path(), "a-good.toml", &format!("{PAIR}{obs}"));
    write(dir.path(), "b-bad.toml", "unit = \"kcal/mol\"\n[states\n");
    write(
        dir.path(),
        "c-off.toml",
        &format!("{PAIR}{obs}tolerance = 0.1\n"),
    );
    let out = eyrie(
        &["check", dir.path().to_str().unwrap(), "--json"],
        dir.path(),
    );
    assert_eq!(
        out.status.code(),
        Some(2),
        "invalid input outranks a disagreement"
    );
    let v = json(&out);
    let files: Vec<&str> = v
        .as_array()
        .unwrap()
        .iter()
        .map(|e| e["file"].as_str().unwrap())
        .collect();
    assert_eq!(
        files.len(),
        2,
        "both readable files were checked: {files:?}"
    );
    assert!(files[0].ends_with("a-good.toml") && files[1].ends_with("c-off.toml"));
    assert!(String::from_utf8_lossy(&out.stderr).contains("b-bad.toml"));
}

#[test]
fn observations_are_validated_with_located_errors() {
    let dir = tempfile::tempdir().unwrap();
    let out = check(
        dir.path(),
        "o.toml",
        &format!(
            "{PAIR}[[observed]]\nkind = \"ratoi\"\nvalue = 4.0\n[[observed]]\nkind = \"ratio\"\nproducts = [\"pb\", \"px\"]\nvalue = -1\n"
        ),
        false,
    );
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("did you mean 'ratio'"), "{err}");
    assert!(
        err.contains("o.toml:21:") && err.contains("unknown id 'px'"),
        "{err}"
    );
}
