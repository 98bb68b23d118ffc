//! `--plot` of `eyrie sweep` and `eyrie simulate` as a user runs it: the chart
//! file in each format, the table and JSON unchanged, bad output names refused
//! before any work with nothing written.

use crate::common;
use common::{eyrie, repo};

const SWEEP: [&str; 8] = [
    "sweep", "PROFILE", "--from", "-78 C", "--to", "100 C", "--steps", "12",
];

fn sweep_args<'a>(profile: &'a str, extra: &[&'a str]) -> Vec<&'a str> {
    let mut args: Vec<&str> = SWEEP.to_vec();
    args[1] = profile;
    args.extend_from_slice(extra);
    args
}

#[test]
fn sweep_plot_names_every_product_and_marks_the_isoselective_temperature() {
    let dir = tempfile::tempdir().unwrap();
    let profile = repo("profiles/entropy-switch.toml");
    let plain = eyrie(&sweep_args(&profile, &[]), dir.path());
    let out = eyrie(&sweep_args(&profile, &["--plot", "x.svg"]), dir.path());
    assert_eq!(out.status.code(), Some(0), "{out:?}");
    // The plot is an extra: the table is the same bytes.
    assert_eq!(out.stdout, plain.stdout);
    let svg = std::fs::read_to_string(dir.path().join("x.svg")).unwrap();
    roxmltree::Document::parse(&svg).expect("well-formed SVG");
    // The labels of the profile's two products (profiles/entropy-switch.toml).
    for label in ["bicyclic adduct", "open adduct", "temperature (°C)"] {
        assert!(svg.contains(label), "{label} missing");
    }
    // The table says 26.8 °C (300.00 K); the marker shows the same number.
    let table = String::from_utf8(plain.stdout).unwrap();
    assert!(table.contains("26.8 °C"), "{table}");
    assert!(svg.contains("isoselective: 26.8 °C"));
    // Same input, same bytes.
    let again = eyrie(&sweep_args(&profile, &["--plot", "y.svg"]), dir.path());
    assert_eq!(again.status.code(), Some(0));
    assert_eq!(
        std::fs::read(dir.path().join("y.svg")).unwrap(),
        svg.as_bytes()
    );
}

#[test]
fn sweep_json_is_unchanged_by_plot_and_png_has_the_asked_size() {
    let dir = tempfile::tempdir().unwrap();
    let profile = repo("profiles/entropy-switch.toml");
    let json = eyrie(&sweep_args(&profile, &["--json"]), dir.path());
    let both = eyrie(
        &sweep_args(
            &profile,
            &[
                "--json", "--plot", "s.png", "--dpi", "100", "--width", "120",
            ],
        ),
        dir.path(),
    );
    assert_eq!(both.status.code(), Some(0), "{both:?}");
    assert_eq!(both.stdout, json.stdout);
    let bytes = std::fs::read(dir.path().join("s.png")).unwrap();
    let reader = png::Decoder::new(std::io::Cursor::new(bytes))
        .read_info()
        .unwrap();
    // 120 × 65 mm at 100 dpi: 472.4 → 472 and 255.9 → 256 px (closed form).
    assert_eq!((reader.info().width, reader.info().height), (472, 256));
}

#[test]
fn simulate_plot_linear_and_log_time() {
    let dir = tempfile::tempdir().unwrap();
    let profile = repo("profiles/demo.toml");
    let plain = eyrie(&["simulate", &profile], dir.path());
    let out = eyrie(&["simulate", &profile, "--plot", "c.svg"], dir.path());
    assert_eq!(out.status.code(), Some(0), "{out:?}");
    assert_eq!(out.stdout, plain.stdout);
    let linear = std::fs::read_to_string(dir.path().join("c.svg")).unwrap();
    // The demo reaches 99 % conversion after about 34 min (eyrie simulate
    // table): minutes read best on a linear axis.
    assert!(linear.contains("time (min)"), "time unit");
    assert!(linear.contains("allyl ether") && linear.contains("rearranged ketone"));
    let out = eyrie(
        &["simulate", &profile, "--plot", "c.pdf", "--log-time"],
        dir.path(),
    );
    assert_eq!(out.status.code(), Some(0), "{out:?}");
    assert!(
        std::fs::read(dir.path().join("c.pdf"))
            .unwrap()
            .starts_with(b"%PDF")
    );
    let out = eyrie(
        &["simulate", &profile, "--plot", "l.svg", "--log-time"],
        dir.path(),
    );
    assert_eq!(out.status.code(), Some(0));
    let log = std::fs::read_to_string(dir.path().join("l.svg")).unwrap();
    assert!(log.contains("time (s)"));
    // Decade labels: "10" with the exponent raised in a tspan.
    assert!(log.contains(">10<") || log.contains(">10</tspan>"), "{log}");
    assert_ne!(log, linear);
}

#[test]
fn bad_output_names_fail_before_any_work_and_write_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let demo = repo("profiles/demo.toml");
    let switch = repo("profiles/entropy-switch.toml");
    let runs: Vec<Vec<&str>> = vec![
        vec!["simulate", &demo, "--plot", "c.jpg"],
        vec!["simulate", &demo, "--plot", "c"],
        sweep_args(&switch, &["--plot", "s.txt"]),
    ];
    for args in runs {
        let out = eyrie(&args, dir.path());
        assert_eq!(out.status.code(), Some(2), "{args:?}");
        let err = String::from_utf8_lossy(&out.stderr);
        assert!(err.contains(".svg, .png or .pdf"), "{err}");
        assert!(out.stdout.is_empty(), "no table before the refusal");
    }
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 0);
    // --log-time and the size options mean nothing without --plot.
    for args in [
        vec!["simulate", &demo, "--log-time"],
        vec!["simulate", &demo, "--dpi", "300"],
    ] {
        assert_eq!(eyrie(&args, dir.path()).status.code(), Some(2), "{args:?}");
    }
}

#[test]
fn an_unwritable_plot_exits_3_and_leaves_no_file() {
    let dir = tempfile::tempdir().unwrap();
    let out = eyrie(
        &[
            "simulate",
            &repo("profiles/demo.toml"),
            "--plot",
            "no/such/folder/c.svg",
        ],
        dir.path(),
    );
    assert_eq!(out.status.code(), Some(3), "{out:?}");
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 0);
}

#[test]
fn simulate_plot_draws_a_consumed_coreactant_unless_in_large_excess() {
    let dir = tempfile::tempdir().unwrap();
    // A + W → P with W at `c` mol/L against 1 mol/L of A (invented energies).
    let profile = |c: f64| {
        format!(
            "unit = \"kcal/mol\"\n[coreactants]\nWATERX = {c}\n\
             [states]\nA = {{ g = 0.0, with = [\"WATERX\"] }}\nP = {{ g = -15.0, product = true }}\n\
             [ts]\nts = 19.0\n[[path]]\nname = \"main\"\nvia = [\"A\", \"ts\", \"P\"]\n"
        )
    };
    for (c, drawn) in [(1.0, true), (50.0, false)] {
        let file = common::write(dir.path(), "aw.toml", &profile(c));
        let out = eyrie(
            &["simulate", file.to_str().unwrap(), "--plot", "aw.svg"],
            dir.path(),
        );
        assert_eq!(out.status.code(), Some(0), "{out:?}");
        let svg = std::fs::read_to_string(dir.path().join("aw.svg")).unwrap();
        assert_eq!(svg.contains("WATERX"), drawn, "W at {c} mol/L");
    }
}
