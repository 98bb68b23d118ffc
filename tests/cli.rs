//! The `eyrie` binary as a user runs it: exit codes, outputs, atomic writes,
//! untouched inputs. Each test works in its own temporary folder.

use crate::common;

use common::{eyrie, repo, write};

fn text(bytes: &[u8]) -> String {
    String::from_utf8_lossy(bytes).into_owned()
}

/// The text of every `<text>` element, its lines (tspans) joined by a space: a
/// label broken over two lines still reads as the label.
fn svg_texts(svg: &str) -> Vec<String> {
    let doc = roxmltree::Document::parse(svg).expect("SVG is well-formed XML");
    doc.descendants()
        .filter(|n| n.has_tag_name("text"))
        .map(|n| {
            let parts: Vec<&str> = n
                .descendants()
                .filter(|d| d.is_text())
                .filter_map(|d| d.text())
                .collect();
            parts.join(" ")
        })
        .collect()
}

fn scratch() -> tempfile::TempDir {
    tempfile::tempdir().expect("temp dir")
}

#[test]
fn no_arguments_prints_a_short_usage() {
    let out = eyrie(&[], &std::env::temp_dir());
    assert_eq!(out.status.code(), Some(2));
    let err = text(&out.stderr);
    assert!(
        err.contains("eyrie analyze") && err.contains("eyrie render"),
        "{err}"
    );
}

#[test]
fn version_and_help() {
    let out = eyrie(&["--version"], &std::env::temp_dir());
    assert_eq!(out.status.code(), Some(0));
    assert!(text(&out.stdout).starts_with("eyrie "));
    for cmd in ["analyze", "render"] {
        let out = eyrie(&[cmd, "--help"], &std::env::temp_dir());
        assert_eq!(out.status.code(), Some(0));
        assert!(text(&out.stdout).contains("--temperature"));
    }
}

#[test]
fn analyze_prints_a_table_of_steps_and_paths() {
    let out = eyrie(
        &["analyze", &repo("profiles/demo.toml")],
        &std::env::temp_dir(),
    );
    assert_eq!(out.status.code(), Some(0), "{}", text(&out.stderr));
    let table = text(&out.stdout);
    for needle in [
        "ether → ketone via ts-concerted",
        "stepwise",
        "fragmentation",
        "353.15 K",
        "t½",
    ] {
        assert!(table.contains(needle), "missing {needle:?} in\n{table}");
    }
}

/// Eyring k written out independently of the library: k = (kB·T/h)·exp(−ΔG‡/RT),
/// CODATA 2018 exact constants, 1 cal = 4.184 J (Eyring, J. Chem. Phys. 1935, 3, 107).
fn eyring_kcal(dg: f64, t: f64) -> f64 {
    let (kb, h, na) = (1.380649e-23, 6.62607015e-34, 6.02214076e23);
    kb * t / h * (-dg * 4184.0 / (na * kb * t)).exp()
}

#[test]
fn analyze_json_has_the_documented_fields_and_eyring_numbers() {
    let out = eyrie(
        &["analyze", &repo("profiles/demo.toml"), "--json"],
        &std::env::temp_dir(),
    );
    assert_eq!(out.status.code(), Some(0), "{}", text(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("stdout is JSON");
    assert_eq!(v["unit"], "kcal/mol");
    let t = v["temperature_k"].as_f64().unwrap();
    assert!((t - 353.15).abs() < 1e-9, "80 C is 353.15 K");
    let steps = v["steps"].as_array().unwrap();
    // The demo has 4 TS-steps: concerted, homolysis, recombination, fragmentation.
    assert_eq!(steps.len(), 4);
    let conc = steps.iter().find(|s| s["ts"] == "ts-concerted").unwrap();
    assert_eq!(conc["from"], "ether");
    assert_eq!(conc["to"], "ketone");
    // closed form: barriers are energy differences of the file's values (27.3 − 0, 27.3 + 15.8).
    assert!((conc["barrier_forward"].as_f64().unwrap() - 27.3).abs() < 1e-9);
    assert!((conc["barrier_reverse"].as_f64().unwrap() - 43.1).abs() < 1e-9);
    let kf = conc["k_forward"].as_f64().unwrap();
    assert!((kf / eyring_kcal(27.3, 353.15) - 1.0).abs() < 1e-9);
    let kr = conc["k_reverse"].as_f64().unwrap();
    assert!((kr / eyring_kcal(43.1, 353.15) - 1.0).abs() < 1e-9);
    let paths = v["paths"].as_array().unwrap();
    let names: Vec<&str> = paths.iter().map(|p| p["name"].as_str().unwrap()).collect();
    assert_eq!(names, ["concerted", "stepwise", "fragmentation"]);
    // definition (Kozuch & Shaik 2011): largest rise from a minimum to a later TS:
    // stepwise ether(0) → ts-homolysis(25.1).
    let stepwise = &paths[1];
    assert!((stepwise["apparent_barrier"].as_f64().unwrap() - 25.1).abs() < 1e-9);
    assert_eq!(stepwise["determining_state"], "ether");
    assert_eq!(stepwise["determining_ts"], "ts-homolysis");
}

#[test]
fn temperature_option_overrides_the_file() {
    let out = eyrie(
        &[
            "analyze",
            &repo("profiles/demo.toml"),
            "--json",
            "--temperature",
            "-78 C",
        ],
        &std::env::temp_dir(),
    );
    assert_eq!(out.status.code(), Some(0), "{}", text(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert!((v["temperature_k"].as_f64().unwrap() - 195.15).abs() < 1e-9);
    let k = v["steps"][0]["k_forward"].as_f64().unwrap();
    let dg = v["steps"][0]["barrier_forward"].as_f64().unwrap();
    assert!((k / eyring_kcal(dg, 195.15) - 1.0).abs() < 1e-9);

    let out = eyrie(
        &["analyze", &repo("profiles/demo.toml"), "-T", "0 K"],
        &std::env::temp_dir(),
    );
    assert_eq!(out.status.code(), Some(2));
}

#[test]
fn render_writes_identical_svg_every_time_and_leaves_the_input_alone() {
    let dir = scratch();
    let input = repo("profiles/demo.toml");
    let before = std::fs::read(&input).unwrap();
    let a = eyrie(&["render", &input, "-o", "a.svg"], dir.path());
    assert_eq!(a.status.code(), Some(0), "{}", text(&a.stderr));
    let b = eyrie(&["render", &input, "-o", "b.svg"], dir.path());
    assert_eq!(b.status.code(), Some(0));
    let svg_a = std::fs::read(dir.path().join("a.svg")).unwrap();
    let svg_b = std::fs::read(dir.path().join("b.svg")).unwrap();
    assert_eq!(svg_a, svg_b, "same input, same bytes");
    assert_eq!(std::fs::read(&input).unwrap(), before, "input untouched");
    let texts = svg_texts(&text(&svg_a));
    for label in [
        "allyl ether",
        "radical pair",
        "TS-concerted",
        "TS-fragmentation",
        "diene + phenol",
        "27.3",
        "−15.8",
    ] {
        assert!(
            texts.iter().any(|t| t == label),
            "label {label:?} missing from {texts:?}"
        );
    }
    assert!(texts.iter().any(|t| t.contains("kcal mol⁻¹")));
    // No temporary files are left behind.
    let leftovers: Vec<_> = std::fs::read_dir(dir.path())
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .filter(|n| n.starts_with('.'))
        .collect();
    assert!(leftovers.is_empty(), "{leftovers:?}");
}

#[test]
fn render_default_output_is_the_profile_stem() {
    let dir = scratch();
    let out = eyrie(&["render", &repo("profiles/conformers.toml")], dir.path());
    assert_eq!(out.status.code(), Some(0), "{}", text(&out.stderr));
    assert!(dir.path().join("conformers.svg").exists());
}

#[test]
fn hostile_labels_come_out_as_safe_svg_text() {
    let dir = scratch();
    let profile = write(
        dir.path(),
        "hostile.toml",
        r#"unit = "kcal/mol"
[states]
a = { g = 0.0, label = "<script>alert(1)</script>" }
b = { g = -5.0, label = "A & B \"quoted\" 'single'" }
[ts]
t = { g = 10.0, label = "]]> <!-- x -->" }
[[path]]
name = "<b>&amp;"
via = ["a", "t", "b"]
"#,
    );
    let out = eyrie(
        &["render", profile.to_str().unwrap(), "-o", "h.svg"],
        dir.path(),
    );
    assert_eq!(out.status.code(), Some(0), "{}", text(&out.stderr));
    let svg = std::fs::read_to_string(dir.path().join("h.svg")).unwrap();
    assert!(!svg.contains("<script"), "raw tag leaked");
    let texts = svg_texts(&svg);
    for label in [
        "<script>alert(1)</script>",
        "A & B \"quoted\" 'single'",
        "]]> <!-- x -->",
    ] {
        assert!(
            texts.iter().any(|t| t == label),
            "{label:?} not kept as text: {texts:?}"
        );
    }
}

#[test]
fn invalid_profile_exits_2_with_a_located_error_and_writes_nothing() {
    let dir = scratch();
    let profile = write(
        dir.path(),
        "bad.toml",
        "unit = \"kcal/mol\"\n[states]\na = 0.0\nb = -1.0\n[ts]\nt = 5.0\n[[path]]\nvia = [\"a\", \"tt\", \"b\"]\n",
    );
    let existing = write(dir.path(), "fig.svg", "previous figure");
    let out = eyrie(
        &["render", profile.to_str().unwrap(), "-o", "fig.svg"],
        dir.path(),
    );
    assert_eq!(out.status.code(), Some(2));
    let err = text(&out.stderr);
    assert!(err.contains("bad.toml:8:"), "located: {err}");
    assert!(err.contains("tt"), "{err}");
    assert_eq!(
        std::fs::read_to_string(existing).unwrap(),
        "previous figure"
    );
}

#[test]
fn io_problems_exit_3() {
    let dir = scratch();
    let out = eyrie(&["analyze", "does-not-exist.toml"], dir.path());
    assert_eq!(out.status.code(), Some(3));
    assert!(text(&out.stderr).contains("does-not-exist.toml"));
    let out = eyrie(
        &[
            "render",
            &repo("profiles/demo.toml"),
            "-o",
            "no/such/folder/fig.svg",
        ],
        dir.path(),
    );
    assert_eq!(out.status.code(), Some(3), "{}", text(&out.stderr));
}

#[test]
fn unsupported_output_format_is_a_usage_error() {
    let dir = scratch();
    let out = eyrie(
        &["render", &repo("profiles/demo.toml"), "-o", "fig.bmp"],
        dir.path(),
    );
    assert_eq!(out.status.code(), Some(2));
    assert!(!dir.path().join("fig.bmp").exists());
}

#[test]
fn every_shipped_profile_analyzes_and_renders_without_warnings() {
    let dir = scratch();
    for entry in std::fs::read_dir(repo("profiles")).unwrap() {
        let path = entry.unwrap().path();
        if path.extension().is_none_or(|e| e != "toml") {
            continue;
        }
        let p = path.to_str().unwrap();
        let out = eyrie(&["analyze", p], dir.path());
        assert_eq!(out.status.code(), Some(0), "{p}: {}", text(&out.stderr));
        assert!(out.stderr.is_empty(), "{p} warns: {}", text(&out.stderr));
        let out = eyrie(&["render", p, "-o", "x.svg"], dir.path());
        assert_eq!(out.status.code(), Some(0), "{p}: {}", text(&out.stderr));
    }
}

#[test]
fn convert_between_ratio_ee_and_ddg() {
    // closed form: ΔΔG‡ = RT ln r, ee = (r − 1)/(r + 1); RT at 298.15 K from CODATA 2018
    // (0.592484949713764 kcal/mol, tests/reference/constants.toml).
    let rt: f64 = 0.592484949713764;
    let out = eyrie(&["convert", "95:5", "--json"], &std::env::temp_dir());
    assert_eq!(out.status.code(), Some(0), "{}", text(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert!((v["ratio"].as_f64().unwrap() - 19.0).abs() < 1e-12);
    assert!((v["ee_percent"].as_f64().unwrap() - 90.0).abs() < 1e-9);
    assert!((v["ddg_kcal_mol"].as_f64().unwrap() - rt * 19f64.ln()).abs() < 1e-9);
    assert!((v["ddg_kj_mol"].as_f64().unwrap() - rt * 4.184 * 19f64.ln()).abs() < 1e-9);
    assert!((v["temperature_k"].as_f64().unwrap() - 298.15).abs() < 1e-12);

    let out = eyrie(
        &["convert", "1.8 kcal/mol", "-T", "-78 C", "--json"],
        &std::env::temp_dir(),
    );
    assert_eq!(out.status.code(), Some(0), "{}", text(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let rt195: f64 = 0.387802911073758; // RT at 195.15 K, tests/reference/constants.toml
    assert!((v["ratio"].as_f64().unwrap() / (1.8 / rt195).exp() - 1.0).abs() < 1e-9);

    let out = eyrie(&["convert", "90%ee"], &std::env::temp_dir());
    assert_eq!(out.status.code(), Some(0));
    assert!(text(&out.stdout).contains("19.0:1"));

    let out = eyrie(&["convert", "lots"], &std::env::temp_dir());
    assert_eq!(out.status.code(), Some(2));
    assert!(
        text(&out.stderr).contains("95:5"),
        "the error shows the accepted forms"
    );
}

#[test]
fn unit_option_reports_absolute_hartree_inputs_in_kcal() {
    // closed form: unit conversion with 1 hartree = 2625.499639 kJ/mol (CODATA 2018)
    // and 1 cal = 4.184 J; energies from profiles/hartree-absolute.toml.
    let out = eyrie(
        &[
            "analyze",
            &repo("profiles/hartree-absolute.toml"),
            "--unit",
            "kcal/mol",
            "--json",
        ],
        &std::env::temp_dir(),
    );
    assert_eq!(out.status.code(), Some(0), "{}", text(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["unit"], "kcal/mol");
    let want = (-842.284919 - -842.315604) * 2625.499639 / 4.184;
    let got = v["steps"][0]["barrier_forward"].as_f64().unwrap();
    assert!((got - want).abs() < 1e-6, "{got} vs {want}");
}

#[test]
fn start_key_decides_where_the_material_starts() {
    // Slow rotation (24 kcal/mol) against cyclisations at 18–19 kcal/mol: a kinetic
    // quench, so each rotamer gives its own product (Seeman, Chem. Rev. 1983, slow limit).
    let dir = scratch();
    let body = r#"unit = "kcal/mol"
[states]
rot-e = 0.0
rot-z = 0.9
pa = -8.2
pb = -7.4
[ts]
ts-rot = 24.0
ts-a = 19.4
ts-b = 18.1
[[path]]
via = ["rot-e", "ts-rot", "rot-z"]
[[path]]
via = ["rot-e", "ts-a", "pa"]
[[path]]
via = ["rot-z", "ts-b", "pb"]
"#;
    for (start, major) in [("", "pa"), ("start = \"rot-z\"\n", "pb")] {
        let p = write(dir.path(), "q.toml", &format!("{start}{body}"));
        let out = eyrie(&["analyze", p.to_str().unwrap(), "--json"], dir.path());
        assert_eq!(out.status.code(), Some(0), "{}", text(&out.stderr));
        let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        let sel = &v["selectivity"];
        assert_eq!(sel["regime"], "kinetic-quench");
        assert!(
            (sel["products"][major].as_f64().unwrap() - 1.0).abs() < 1e-12,
            "{sel}"
        );
    }
}

#[test]
fn sweep_finds_the_isoselective_temperature() {
    // closed form: ΔΔG‡(T) = ΔΔH‡ − T·ΔΔS‡ = 0 at T = ΔΔH‡/ΔΔS‡; profiles/entropy-switch.toml
    // has ΔΔH‡ = 14.1 − 12.0 = 2.1 kcal/mol, ΔΔS‡ = −7 − (−14) = 7 cal/(mol·K) → 300 K.
    let out = eyrie(
        &[
            "sweep",
            &repo("profiles/entropy-switch.toml"),
            "--from",
            "-78 C",
            "--to",
            "100 C",
            "--json",
        ],
        &std::env::temp_dir(),
    );
    assert_eq!(out.status.code(), Some(0), "{}", text(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let iso = v["isoselective"].as_array().unwrap();
    assert_eq!(iso.len(), 1);
    assert!((iso[0]["temperature_k"].as_f64().unwrap() - 300.0).abs() < 1e-6);
    let rows = v["rows"].as_array().unwrap();
    assert_eq!(rows.len(), 9);
    // Below 300 K the ring product wins, above it the open one.
    assert!(rows[0]["products"]["ring"].as_f64().unwrap() > 0.5);
    assert!(rows[8]["products"]["open"].as_f64().unwrap() > 0.5);

    let out = eyrie(
        &[
            "sweep",
            &repo("profiles/demo.toml"),
            "--from",
            "300",
            "--to",
            "400",
            "--steps",
            "1",
        ],
        &std::env::temp_dir(),
    );
    assert_eq!(out.status.code(), Some(2));
}

#[test]
fn enthalpy_and_entropy_follow_the_temperature() {
    // closed form: G = H − T·S; TS-ring barrier at 273.15 K = 12.0 + 273.15 × 0.014.
    let out = eyrie(
        &[
            "analyze",
            &repo("profiles/entropy-switch.toml"),
            "-T",
            "0 C",
            "--json",
        ],
        &std::env::temp_dir(),
    );
    assert_eq!(out.status.code(), Some(0), "{}", text(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let step = v["steps"]
        .as_array()
        .unwrap()
        .iter()
        .find(|s| s["ts"] == "ts-ring")
        .unwrap();
    let want = 12.0 + 273.15 * 0.014;
    assert!((step["barrier_forward"].as_f64().unwrap() - want).abs() < 1e-9);
}

#[test]
fn analyze_over_a_folder_reports_a_bad_file_and_finishes_the_rest() {
    let dir = scratch();
    let good = std::fs::read_to_string(repo("profiles/conformers.toml")).unwrap();
    write(dir.path(), "a.toml", &good);
    write(
        dir.path(),
        "b.toml",
        "unit = \"kcal/mol\"\n[states]\nx = 0.0\n[[path]]\nvia = [\"x\", \"y\"]\n",
    );
    write(dir.path(), "c.toml", &good);
    let out = eyrie(&["analyze", ".", "--json"], dir.path());
    assert_eq!(out.status.code(), Some(2), "the worst code wins");
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let files: Vec<&str> = v
        .as_array()
        .unwrap()
        .iter()
        .map(|e| e["file"].as_str().unwrap())
        .collect();
    assert_eq!(files, ["./a.toml", "./c.toml"]);
    assert!(v[0]["report"]["steps"].is_array());
    let err = text(&out.stderr);
    assert!(
        err.contains("b.toml:5:") && err.contains("analysed 2 of 3"),
        "{err}"
    );
}

#[test]
fn render_over_a_folder_draws_the_good_files_and_leaves_the_bad_ones_output_alone() {
    let dir = scratch();
    let src = dir.path().join("profiles");
    std::fs::create_dir(&src).unwrap();
    let good = std::fs::read_to_string(repo("profiles/conformers.toml")).unwrap();
    write(&src, "a.toml", &good);
    write(&src, "b.toml", "unit = \"kcal/mol\"\n[states\n");
    write(&src, "c.toml", &good);
    let figs = dir.path().join("figs");
    std::fs::create_dir(&figs).unwrap();
    let old = write(&figs, "b.svg", "the figure from before");
    let out = eyrie(&["render", "profiles", "-o", "figs/"], dir.path());
    assert_eq!(out.status.code(), Some(2), "{}", text(&out.stderr));
    let err = text(&out.stderr);
    assert!(
        err.contains("b.toml:2:") && err.contains("2 figure(s) drawn"),
        "{err}"
    );
    assert!(figs.join("a.svg").exists() && figs.join("c.svg").exists());
    assert_eq!(
        std::fs::read_to_string(&old).unwrap(),
        "the figure from before"
    );
    // A second run skips figures newer than their profiles (as make does: the old
    // b.svg was written after b.toml, so it counts as up to date too).
    let out = eyrie(
        &["render", "profiles", "-o", "figs", "--skip-unchanged"],
        dir.path(),
    );
    assert!(
        text(&out.stderr).contains("0 figure(s) drawn, 3 unchanged"),
        "{}",
        text(&out.stderr)
    );
    assert_eq!(out.status.code(), Some(0));
    // Several profiles need a folder, not a file name.
    let out = eyrie(&["render", "profiles", "-o", "one.svg"], dir.path());
    assert_eq!(out.status.code(), Some(2));
}
