//! `eyrie simulate` as a user runs it: exit codes, CSV and JSON shape,
//! byte-identical output.

use std::process::Command;

fn eyrie(args: &[&str]) -> std::process::Output {
    Command::new(env!("CARGO_BIN_EXE_eyrie"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .unwrap()
}

#[test]
fn exit_codes() {
    assert_eq!(
        eyrie(&["simulate", "profiles/demo.toml"]).status.code(),
        Some(0)
    );
    for bad in [
        vec!["simulate", "profiles/demo.toml", "--until", "2 years"],
        vec!["simulate", "profiles/demo.toml", "--until", "150%"],
        vec!["simulate", "profiles/demo.toml", "--initial", "nosuch=1"],
        vec![
            "simulate",
            "profiles/demo.toml",
            "--initial",
            "ts-concerted=1",
        ],
        vec!["simulate", "profiles/demo.toml", "--initial", "ether=-1"],
        vec![
            "simulate",
            "profiles/catalytic-cycle.toml",
            "--until",
            "99%",
        ],
    ] {
        let out = eyrie(&bad);
        assert_eq!(out.status.code(), Some(2), "{bad:?}");
        assert!(
            String::from_utf8_lossy(&out.stderr).contains("error:"),
            "{bad:?}"
        );
    }
    assert_eq!(
        eyrie(&["simulate", "no/such/file.toml"]).status.code(),
        Some(3)
    );
}

#[test]
fn csv_alone_on_stdout_has_a_header_and_one_column_per_state() {
    let out = eyrie(&["simulate", "profiles/conformers.toml", "--csv"]);
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    let mut lines = text.lines();
    assert_eq!(lines.next().unwrap(), "time_s,rot-e,rot-z,prod-a,prod-b");
    let rows: Vec<Vec<f64>> = lines
        .map(|l| l.split(',').map(|v| v.parse().unwrap()).collect())
        .collect();
    assert!(rows.len() > 10);
    assert!(rows.iter().all(|r| r.len() == 5));
    assert_eq!(rows[0], vec![0.0, 1.0, 0.0, 0.0, 0.0]);
    assert!(rows.windows(2).all(|w| w[1][0] > w[0][0]), "time increases");
}

#[test]
fn csv_to_a_file_and_json_with_the_fixed_keys() {
    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("course.csv");
    let out = eyrie(&[
        "simulate",
        "profiles/conformers.toml",
        "--json",
        "--csv",
        csv.to_str().unwrap(),
    ]);
    assert!(out.status.success());
    assert!(
        std::fs::read_to_string(&csv)
            .unwrap()
            .starts_with("time_s,")
    );
    let json: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert!(json["time_s"].as_f64().unwrap() > 0.0);
    let finals = json["final"].as_object().unwrap();
    assert_eq!(finals.len(), 4);
    let sum: f64 = finals.values().map(|v| v.as_f64().unwrap()).sum();
    assert!((sum - 1.0).abs() < 1e-9, "mass balance");
    let products = json["products"].as_object().unwrap();
    let fractions: f64 = products.values().map(|v| v.as_f64().unwrap()).sum();
    assert!((fractions - 1.0).abs() < 1e-12);
    assert!(String::from_utf8_lossy(&out.stderr).contains("thermal-safety"));
}

#[test]
fn same_input_same_bytes() {
    for args in [
        vec!["simulate", "profiles/demo.toml", "--json"],
        vec!["simulate", "profiles/demo.toml", "--csv"],
        vec!["simulate", "profiles/catalytic-cycle.toml"],
    ] {
        assert_eq!(eyrie(&args).stdout, eyrie(&args).stdout, "{args:?}");
    }
}

/// Rotamers from a Boltzmann start versus pure E (a non-Curtin–Hammett check
/// would need slower rotation; here rotation is fast, so both give the
/// Curtin–Hammett ratio exp(ΔΔG‡/RT) = exp(1.3 kcal/mol / RT) at 25 °C).
#[test]
fn boltzmann_start_and_curtin_hammett_limit() {
    let out = eyrie(&[
        "simulate",
        "profiles/conformers.toml",
        "--boltzmann",
        "rot-e,rot-z",
        "--until",
        "1 h",
        "--json",
    ]);
    assert!(out.status.success());
    let json: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let (a, b) = (
        json["final"]["prod-a"].as_f64().unwrap(),
        json["final"]["prod-b"].as_f64().unwrap(),
    );
    // Closed form (Curtin–Hammett limit; Seeman, Chem. Rev. 1983): rotation at
    // 12.5 kcal/mol is ~1e3× faster than either cyclisation, so within 1 %.
    let rt = 298.15 * 8.31446261815324 / 4184.0;
    let limit = (1.3_f64 / rt).exp();
    assert!(((b / a) / limit - 1.0).abs() < 0.01, "{} vs {limit}", b / a);
}
