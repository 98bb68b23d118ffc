//! `eyrie watch`: draw the figure, then draw it again each time the profile
//! is saved, printing the key numbers; while the file has a mistake, show the
//! located error and leave the last good figure in place.
//!
//! The file is polled every 300 ms rather than watched with OS notifications:
//! editors save in different ways (in place, or a new file renamed over the
//! old one, which ends an inotify watch on the file), and a profile is a few
//! kilobytes, so reading it three times a second costs nothing, needs no extra
//! crate and behaves the same on every system and file share. A change is
//! acted on once the content has stayed the same for one poll, so a save
//! caught half-way is not reported as an error. Ctrl-C ends the watch; since
//! each figure is written by rename, stopping never leaves a half-written one.

use super::error::CliError;
use super::files;
use super::render::{FigureOptions, Target};
use eyrie::format;
use eyrie::report::AnalysisReport;
use eyrie::units::Temperature;
use std::path::Path;
use std::time::Duration;

const POLL: Duration = Duration::from_millis(300);

/// Watches `path` until interrupted. Fails only when the output options are
/// wrong, the profile cannot be read at the start, or the first good figure
/// cannot be written.
pub fn run(
    path: &Path,
    figure: &FigureOptions,
    conditions: &super::Conditions,
) -> Result<(), CliError> {
    let target = figure.resolve(path)?;
    let mut last = read(path)?;
    let mut written_once = false;
    let report = |written_once: &mut bool| match on_change(path, &target, conditions) {
        Ok(summary) => {
            *written_once = true;
            println!("{summary}");
            Ok(())
        }
        Err(e @ CliError::Io { .. }) if !*written_once => Err(e),
        Err(CliError::Invalid { rendered }) => {
            eprint!("{rendered}");
            eprintln!("(figure not updated; waiting for the next save)\n");
            Ok(())
        }
        Err(e) => {
            eprintln!("error: {e}\n(waiting for the next save)\n");
            Ok(())
        }
    };
    eprintln!(
        "watching {} → {} (Ctrl-C to stop)",
        path.display(),
        target.output.display()
    );
    report(&mut written_once)?;
    let mut pending: Option<Vec<u8>> = None;
    loop {
        std::thread::sleep(POLL);
        // A missing file is an editor between delete and rename: wait.
        let Ok(now) = read(path) else { continue };
        if now == last {
            pending = None;
        } else if pending.as_ref() == Some(&now) {
            last = now;
            pending = None;
            report(&mut written_once)?;
        } else {
            pending = Some(now);
        }
    }
}

fn read(path: &Path) -> Result<Vec<u8>, CliError> {
    std::fs::read(path).map_err(|source| CliError::Io {
        action: "read",
        path: path.to_path_buf(),
        source,
    })
}

/// Reads, checks and draws the profile once; on success the figure is
/// replaced and the key numbers are returned, on any failure the old figure
/// stays as it was.
pub(crate) fn on_change(
    path: &Path,
    target: &Target,
    conditions: &super::Conditions,
) -> Result<String, CliError> {
    let (parsed, warnings) = files::load(path)?;
    eprint!("{warnings}");
    let model = conditions.apply(parsed.model);
    target.write(&model)?;
    let analysis = eyrie::kinetics::analyze(&model);
    let report = AnalysisReport::new(&model, &analysis);
    Ok(summary(
        &report,
        model.unit().display_decimals(),
        &target.output,
    ))
}

/// The numbers a chemist tunes a figure by: each path's apparent barrier and
/// half-life, each cycle's span and TOF, the predicted selectivity.
fn summary(r: &AnalysisReport, decimals: usize, output: &Path) -> String {
    let e = |v: f64| format::energy(v, decimals, false);
    let t = Temperature::kelvin(r.temperature_k).expect("validated temperature");
    let mut out = format!("updated {} (T = {t}, {})\n", output.display(), r.unit);
    for p in &r.paths {
        let set_by = match &p.determining_ts {
            Some(ts) => format!("{} → {ts}", p.determining_state),
            None => p.determining_state.clone(),
        };
        out.push_str(&format!(
            "  path {}: apparent barrier {} ({set_by}), t½ {}\n",
            p.name,
            e(p.apparent_barrier),
            format::duration(p.half_life_s)
        ));
    }
    for c in &r.cycles {
        let span = c.span.map_or_else(
            || "no span (ΔGr > 0)".to_string(),
            |s| format!("δE {}", e(s)),
        );
        out.push_str(&format!(
            "  cycle {}: {span}, TOF {} s⁻¹\n",
            c.name,
            format::scientific(c.tof)
        ));
    }
    if let Some(sel) = &r.selectivity {
        let mut products: Vec<(&String, &f64)> = sel.products.iter().collect();
        products.sort_by(|a, b| b.1.total_cmp(a.1).then(a.0.cmp(b.0)));
        let shares: Vec<String> = products
            .iter()
            .map(|(id, f)| format!("{id} {:.1} %", *f * 100.0))
            .collect();
        out.push_str(&format!(
            "  selectivity ({}): {}\n",
            sel.regime,
            shares.join(", ")
        ));
    }
    out
}
