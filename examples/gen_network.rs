//! Writes a large invented profile for benchmarks: a main chain of minima and
//! transition states with a side branch to its own product every tenth state.
//!
//!     cargo run --release --example gen_network -- 1000 > /tmp/network-1000.toml
//!
//! The energies come from a small deterministic generator (no randomness
//! crate), so the same size always gives the same file.

fn main() {
    let n: usize = std::env::args()
        .nth(1)
        .and_then(|a| a.parse().ok())
        .unwrap_or(1000)
        .max(2);
    // A linear congruential sequence in [0, 1): deterministic, dependency-free.
    let mut seed: u64 = 0x2545_f491_4f6c_dd1d;
    let mut next = move || {
        seed = seed.wrapping_mul(6_364_136_223_846_793_005).wrapping_add(1);
        (seed >> 11) as f64 / (1u64 << 53) as f64
    };
    // Main-chain minima: a bounded random walk between −40 and +10 kcal/mol.
    let main_count = n - n / 11;
    let mut g = vec![0.0f64];
    while g.len() < main_count {
        let last = *g.last().unwrap();
        g.push((last - 2.0 + 4.0 * next()).clamp(-40.0, 10.0));
    }
    let mut states = String::new();
    let mut ts = String::new();
    let mut paths = String::new();
    let mut via = Vec::new();
    for (i, gi) in g.iter().enumerate() {
        states += &format!("m{i} = {gi:.2}\n");
        via.push(format!("\"m{i}\""));
        if i + 1 < g.len() {
            ts += &format!("ts{i} = {:.2}\n", gi.max(g[i + 1]) + 4.0 + 14.0 * next());
            via.push(format!("\"ts{i}\""));
        }
        if i % 10 == 9 && i / 10 < n / 11 {
            let b = i / 10;
            states += &format!("side{b} = {:.2}\n", gi - 5.0 - 10.0 * next());
            ts += &format!("ts-side{b} = {:.2}\n", gi + 8.0 + 12.0 * next());
            paths += &format!(
                "[[path]]\nname = \"branch {b}\"\nvia = [\"m{i}\", \"ts-side{b}\", \"side{b}\"]\n\n"
            );
        }
    }
    println!("title = \"Generated network of about {n} states (benchmark data)\"");
    println!("unit = \"kcal/mol\"\nzero = \"m0\"\n");
    println!("[states]\n{states}");
    println!("[ts]\n{ts}");
    println!("[[path]]\nname = \"main\"\nvia = [{}]\n", via.join(", "));
    print!("{paths}");
}
