//! The energetic span TOF of a `cycle = true` path equals the turnover of the
//! same cycle solved as linear mass-action steady-state equations — an
//! independent computation (both directions of every step from the Eyring
//! equation, total catalyst 1, solved here by state reduction). Property
//! test over random cycles; the equivalence is the central result of Kozuch &
//! Shaik, J. Phys. Chem. A 2008, 112, 6032.

use proptest::prelude::*;

/// Stationary distribution of a continuous-time Markov chain with rates
/// `q[i][j]` (i → j), by the Grassmann–Taksar–Heyman state reduction (Oper. Res.
/// 1985, 33, 1107): no subtractions, so rates spanning forty decades keep full
/// relative accuracy (a plain linear solve loses digits here).
#[allow(clippy::needless_range_loop)] // indices as in the published algorithm
fn stationary(mut q: Vec<Vec<f64>>) -> Vec<f64> {
    let n = q.len();
    for k in (1..n).rev() {
        let s: f64 = (0..k).map(|j| q[k][j]).sum();
        for i in 0..k {
            q[i][k] /= s;
        }
        for i in 0..k {
            for j in 0..k {
                if i != j {
                    q[i][j] += q[i][k] * q[k][j];
                }
            }
        }
    }
    let mut x = vec![0.0; n];
    x[0] = 1.0;
    for k in 1..n {
        x[k] = (0..k).map(|i| x[i] * q[i][k]).sum();
    }
    let total: f64 = x.iter().sum();
    x.iter().map(|v| v / total).collect()
}

/// Steady-state turnover (s⁻¹) of a cycle in kcal/mol at T (K).
fn steady_state_tof(ints: &[f64], tss: &[f64], dgr: f64, t: f64) -> f64 {
    // CODATA 2018 exact constants; 1 cal = 4.184 J.
    let (kb, h, na) = (1.380649e-23, 6.62607015e-34, 6.02214076e23);
    let rt = na * kb * t / 4184.0;
    let k = |dg: f64| kb * t / h * (-dg / rt).exp();
    let n = ints.len();
    let next = |i: usize| {
        if i + 1 < n {
            ints[i + 1]
        } else {
            ints[0] + dgr
        }
    };
    let kf: Vec<f64> = (0..n).map(|i| k(tss[i] - ints[i])).collect();
    let kr: Vec<f64> = (0..n).map(|i| k(tss[i] - next(i))).collect();
    // Mass-action steady state of the catalyst states, total 1: the stationary
    // distribution of the chain i → i+1 (kf_i), i+1 → i (kr_i), wrapping around.
    let mut q = vec![vec![0.0; n]; n];
    for i in 0..n {
        q[i][(i + 1) % n] += kf[i];
        q[(i + 1) % n][i] += kr[i];
    }
    let x = stationary(q);
    // Every step carries the same net flux; read it where forward and reverse
    // cancel least (net flux J_i = kf_i x_i − kr_i x_{i+1}, the same for every i).
    (0..n)
        .map(|i| (kf[i] * x[i], kr[i] * x[(i + 1) % n]))
        .max_by(|p, q| {
            let share = |(f, r): &(f64, f64)| (f - r).abs() / f.max(*r);
            share(p).total_cmp(&share(q))
        })
        .map(|(f, r)| f - r)
        .unwrap()
}

fn profile_text(ints: &[f64], tss: &[f64], dgr: f64, t: f64) -> String {
    let mut s = format!("unit = \"kcal/mol\"\ntemperature = {t:?}\n[states]\n");
    for (i, g) in ints.iter().enumerate() {
        s += &format!("i{i} = {g:?}\n");
    }
    s += &format!("cat-p = {:?}\n[ts]\n", ints[0] + dgr);
    for (i, g) in tss.iter().enumerate() {
        s += &format!("t{i} = {g:?}\n");
    }
    let mut via: Vec<String> = Vec::new();
    for i in 0..ints.len() {
        via.push(format!("\"i{i}\""));
        via.push(format!("\"t{i}\""));
    }
    via.push("\"cat-p\"".into());
    s += &format!(
        "[[path]]\nname = \"c\"\ncycle = true\nvia = [{}]\n",
        via.join(", ")
    );
    s
}

fn cycle() -> impl Strategy<Value = (Vec<f64>, Vec<f64>, f64, f64)> {
    (2usize..7).prop_flat_map(|n| {
        (
            prop::collection::vec(-15.0f64..10.0, n),
            prop::collection::vec(2.0f64..25.0, n),
            prop_oneof![-30.0f64..-0.5, 0.5f64..8.0],
            200.0f64..400.0,
        )
            .prop_map(|(mut ints, rises, dgr, t)| {
                ints[0] = 0.0;
                let n = ints.len();
                let tss = (0..n)
                    .map(|i| {
                        let next = if i + 1 < n {
                            ints[i + 1]
                        } else {
                            ints[0] + dgr
                        };
                        ints[i].max(next) + rises[i]
                    })
                    .collect();
                (ints, tss, dgr, t)
            })
    })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(300))]
    #[test]
    fn energetic_span_tof_equals_the_steady_state_turnover((ints, tss, dgr, t) in cycle()) {
        let text = profile_text(&ints, &tss, dgr, t);
        let parsed = eyrie::profile::parse(&text).expect("generated profile is valid");
        let report = eyrie::report::AnalysisReport::new(
            &parsed.model,
            &eyrie::kinetics::analyze(&parsed.model),
        );
        prop_assert_eq!(report.cycles.len(), 1);
        let tof = report.cycles[0].tof;
        let want = steady_state_tof(&ints, &tss, dgr, t);
        prop_assert!((tof / want - 1.0).abs() < 1e-9, "TOF {} vs steady state {}\n{}", tof, want, text);
    }
}
