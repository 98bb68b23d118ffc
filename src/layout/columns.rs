//! Horizontal order of the stationary points, from the graph the paths make.
//!
//! Columns are longest-path layers of the directed graph of consecutive
//! path entries, so a shared prefix is drawn once, branches fan out to the
//! right and rejoining paths meet at the shared state. Final states (sinks)
//! move to the last column of their network, so products line up; a run of
//! points between two branch or end points (e.g. a lone concerted TS spanning
//! a stepwise route) is spread evenly between them instead of hugging the
//! left. A graph with a cycle falls back to the order along each path.
//!
//! A profile may pin points to columns (`pins`, 0-based). Pinned points stay
//! where they are put and the others keep one column per step around them;
//! where two pins leave less room than that, every step is shortened by the
//! same factor (the largest that fits), so order along each path is kept.

/// Column (possibly fractional) of every point; `None` for points on no
/// path. `paths` holds indices below `n`; `pins[i]`, when given, is the
/// column of point `i` (missing entries mean no pin). `clash(a, b)` tells
/// whether points `a` and `b` in one column would crowd each other's texts.
pub fn assign(
    n: usize,
    paths: &[Vec<usize>],
    pins: &[Option<usize>],
    clash: &dyn Fn(usize, usize) -> bool,
) -> Vec<Option<f64>> {
    let mut on = vec![false; n];
    let mut succ: Vec<Vec<usize>> = vec![Vec::new(); n];
    let mut pred: Vec<Vec<usize>> = vec![Vec::new(); n];
    for path in paths {
        for &p in path {
            on[p] = true;
        }
        for w in path.windows(2) {
            let (a, b) = (w[0], w[1]);
            if a != b && !succ[a].contains(&b) {
                succ[a].push(b);
                pred[b].push(a);
            }
        }
    }
    let pin = |v: usize| pins.get(v).copied().flatten().map(|c| c as f64);
    let Some(order) = topological(n, &on, &succ, &pred) else {
        let mut out = along_paths(n, paths);
        for (v, c) in out.iter_mut().enumerate() {
            if let (Some(c), Some(p)) = (c.as_mut(), pin(v)) {
                *c = p;
            }
        }
        return out;
    };
    let graph = Graph {
        order: &order,
        succ: &succ,
        pred: &pred,
        pins: &(0..n).map(pin).collect::<Vec<_>>(),
    };
    let step = graph.largest_step();
    let mut col = graph.earliest(step);
    // Sinks to the last column of their connected network.
    let comp = components(n, &succ, &pred);
    let mut last = vec![f64::NEG_INFINITY; n];
    for v in 0..n {
        if on[v] {
            last[comp[v]] = last[comp[v]].max(col[v]);
        }
    }
    // Sinks whose texts would stack into each other in that column (near
    // energies) step one column further right each, so product ends read
    // as a staircase instead of crowding one column. The sink of the
    // longest path keeps the last column; others follow by earliest column.
    let mut sinks: Vec<usize> = (0..n)
        .filter(|&v| on[v] && succ[v].is_empty() && !pred[v].is_empty() && pin(v).is_none())
        .collect();
    sinks.sort_by(|&a, &b| col[b].total_cmp(&col[a]).then(a.cmp(&b)));
    let mut placed: Vec<usize> = Vec::new();
    // A stepped end keeps its branch where it was: only its last connector
    // grows (spreading the branch would crowd the middle of the figure).
    let mut aligned = col.clone();
    for v in sinks {
        let mut c = last[comp[v]];
        while placed
            .iter()
            .any(|&w| comp[w] == comp[v] && col[w] == c && clash(v, w))
        {
            c += 1.0;
        }
        aligned[v] = last[comp[v]];
        col[v] = c;
        placed.push(v);
    }
    // A pin at the far left with points before it would push them off the
    // page: move everything right instead (the profile refuses this case).
    let least = (0..n)
        .filter(|&v| on[v])
        .map(|v| col[v])
        .fold(0.0, f64::min);
    let mut out: Vec<Option<f64>> = (0..n).map(|v| on[v].then_some(col[v] - least)).collect();
    // Spread runs of pass-through points between their anchors.
    let through = |v: usize| pred[v].len() == 1 && succ[v].len() == 1 && pin(v).is_none();
    for v in 0..n {
        if !on[v] || !through(v) || through(pred[v][0]) {
            continue;
        }
        // v starts a run; walk to its end (no cycles here, so it ends).
        let start = pred[v][0];
        let mut run = vec![v];
        let mut w = succ[v][0];
        while through(w) {
            run.push(w);
            w = succ[w][0];
        }
        let (a, b) = (col[start] - least, aligned[w] - least);
        let k = run.len() as f64 + 1.0;
        // No more than `MAX_SPREAD` columns a step: a short side branch
        // ending far right (its end aligned with the products) stays near
        // where it leaves, not in the middle of the busy branches.
        let b = b.min(a + MAX_SPREAD * k);
        for (i, &r) in run.iter().enumerate() {
            out[r] = Some(a + (b - a) * (i as f64 + 1.0) / k);
        }
    }
    out
}

/// Longest step (in columns) of a spread run of pass-through points.
const MAX_SPREAD: f64 = 2.0;

/// The path graph in topological order, with its pins.
struct Graph<'a> {
    order: &'a [usize],
    succ: &'a [Vec<usize>],
    pred: &'a [Vec<usize>],
    pins: &'a [Option<f64>],
}

impl Graph<'_> {
    /// Latest column of each point when every step is `step` columns long:
    /// its pin, or `step` before the latest of its successors (∞ when no pin
    /// lies downstream).
    fn latest(&self, step: f64) -> Vec<f64> {
        let mut hi = vec![f64::INFINITY; self.pins.len()];
        for &v in self.order.iter().rev() {
            let mut h = self.pins[v].unwrap_or(f64::INFINITY);
            for &w in &self.succ[v] {
                h = h.min(hi[w] - step);
            }
            hi[v] = h;
        }
        hi
    }

    /// Earliest column of each point with steps of `step` columns: its pin,
    /// else `step` after its latest predecessor; a first point starts at 0
    /// unless a pin downstream needs it further left.
    fn earliest(&self, step: f64) -> Vec<f64> {
        let hi = self.latest(step);
        let mut lo = vec![0.0; self.pins.len()];
        for &v in self.order {
            lo[v] = match self.pins[v] {
                Some(p) => p,
                None if self.pred[v].is_empty() => hi[v].min(0.0),
                None => self.pred[v]
                    .iter()
                    .map(|&u| lo[u] + step)
                    .fold(f64::NEG_INFINITY, f64::max),
            };
        }
        lo
    }

    /// Whether every pin can be kept with steps of `step` columns.
    fn fits(&self, step: f64) -> bool {
        let hi = self.latest(step);
        let lo = self.earliest(step);
        self.order.iter().all(|&v| {
            self.pred[v]
                .iter()
                .all(|&u| lo[u] + step <= lo[v] + 1e-9 && lo[u] <= hi[u] + 1e-9)
        })
    }

    /// One column per step when the pins allow it, else the largest shorter
    /// step that keeps them (bisection; fitting is monotone in the step).
    fn largest_step(&self) -> f64 {
        if self.pins.iter().all(Option::is_none) || self.fits(1.0) {
            return 1.0;
        }
        let (mut ok, mut bad) = (1.0 / 1024.0, 1.0);
        for _ in 0..30 {
            let mid = (ok + bad) / 2.0;
            if self.fits(mid) { ok = mid } else { bad = mid }
        }
        ok
    }
}

/// Kahn's algorithm, smallest index first so the order is deterministic;
/// `None` when the graph has a cycle.
fn topological(
    n: usize,
    on: &[bool],
    succ: &[Vec<usize>],
    pred: &[Vec<usize>],
) -> Option<Vec<usize>> {
    let mut indeg: Vec<usize> = pred.iter().map(Vec::len).collect();
    let mut ready: std::collections::BTreeSet<usize> =
        (0..n).filter(|&v| on[v] && indeg[v] == 0).collect();
    let mut order = Vec::new();
    while let Some(v) = ready.pop_first() {
        order.push(v);
        for &w in &succ[v] {
            indeg[w] -= 1;
            if indeg[w] == 0 {
                ready.insert(w);
            }
        }
    }
    (order.len() == on.iter().filter(|&&b| b).count()).then_some(order)
}

/// Connected components (ignoring direction), labelled by smallest member.
fn components(n: usize, succ: &[Vec<usize>], pred: &[Vec<usize>]) -> Vec<usize> {
    let mut comp = vec![usize::MAX; n];
    for s in 0..n {
        if comp[s] != usize::MAX {
            continue;
        }
        let mut stack = vec![s];
        comp[s] = s;
        while let Some(v) = stack.pop() {
            for &w in succ[v].iter().chain(&pred[v]) {
                if comp[w] == usize::MAX {
                    comp[w] = s;
                    stack.push(w);
                }
            }
        }
    }
    comp
}

/// Fallback for cyclic graphs: the first path numbers its points 0, 1, 2, …;
/// a later path continues from the column of the last point it already
/// shares. Each point keeps its first column.
fn along_paths(n: usize, paths: &[Vec<usize>]) -> Vec<Option<f64>> {
    let mut out: Vec<Option<f64>> = vec![None; n];
    for path in paths {
        let mut next = 0.0;
        for &p in path {
            match out[p] {
                Some(c) => next = c + 1.0,
                None => {
                    out[p] = Some(next);
                    next += 1.0;
                }
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn cols(n: usize, paths: &[&[usize]]) -> Vec<Option<f64>> {
        let paths: Vec<Vec<usize>> = paths.iter().map(|p| p.to_vec()).collect();
        assign(n, &paths, &[], &|_, _| false)
    }

    fn pinned(n: usize, paths: &[&[usize]], pins: &[(usize, usize)]) -> Vec<f64> {
        let paths: Vec<Vec<usize>> = paths.iter().map(|p| p.to_vec()).collect();
        let mut p = vec![None; n];
        for &(i, c) in pins {
            p[i] = Some(c);
        }
        assign(n, &paths, &p, &|_, _| false)
            .into_iter()
            .map(Option::unwrap)
            .collect()
    }

    #[test]
    fn a_pin_to_the_right_leaves_a_gap_and_keeps_the_rest() {
        // a → t1 → b → t2 → c with b pinned to column 4: a, t1 keep 0 and 1
        // (t1 is then spread halfway), c follows b's pin.
        let c = pinned(5, &[&[0, 1, 2, 3, 4]], &[(2, 4)]);
        assert_eq!(c, vec![0.0, 2.0, 4.0, 5.0, 6.0]);
    }

    #[test]
    fn pins_closer_than_the_steps_between_them_shorten_every_step() {
        // Four steps between pins 0 and 2: each step is half a column.
        let c = pinned(5, &[&[0, 1, 2, 3, 4]], &[(0, 0), (4, 2)]);
        assert_eq!(c, vec![0.0, 0.5, 1.0, 1.5, 2.0]);
        // Order along the path is kept whatever the pins.
        assert!(c.windows(2).all(|w| w[0] < w[1]));
    }

    #[test]
    fn products_align_unless_pinned() {
        // Two branches from a; pa pinned to column 3, pb follows the usual rule.
        let c = pinned(5, &[&[0, 1, 2], &[0, 3, 4]], &[(2, 3)]);
        assert_eq!(c[2], 3.0);
        assert_eq!(c[4], 3.0); // sink moved to the last column of the network
        assert_eq!(c[1], 1.5);
    }

    #[test]
    fn a_pin_at_the_left_edge_with_points_before_it_shifts_everything() {
        let c = pinned(3, &[&[0, 1, 2]], &[(1, 0)]);
        assert_eq!(c, vec![0.0, 1.0, 2.0]);
    }

    #[test]
    fn demo_network_branches_rejoins_and_centres_the_concerted_ts() {
        // 0 ether, 1 pair, 2 ketone, 3 fragments, 4 ts-conc, 5 ts-hom, 6 ts-rec, 7 ts-frag
        let c = cols(8, &[&[0, 4, 2], &[0, 5, 1, 6, 2], &[1, 7, 3]]);
        let c: Vec<f64> = c.into_iter().map(Option::unwrap).collect();
        assert_eq!(c, vec![0.0, 2.0, 4.0, 4.0, 2.0, 1.0, 3.0, 3.0]);
    }

    #[test]
    fn shared_prefix_is_one_column_per_point() {
        // a → t1 → b, then b → t2 → c and b → t3 → d
        let c = cols(7, &[&[0, 1, 2, 3, 4], &[0, 1, 2, 5, 6]]);
        assert_eq!(c[0], Some(0.0));
        assert_eq!(c[2], Some(2.0));
        assert_eq!(c[3], c[5]); // the two branch TSs share a column
        assert_eq!(c[4], Some(4.0));
        assert_eq!(c[6], Some(4.0));
    }

    #[test]
    fn products_move_to_the_last_column() {
        // Conformer pair: e → ts-rot → z → ts-b → pb; e → ts-a → pa.
        let c = cols(7, &[&[0, 1, 2], &[0, 3, 4], &[2, 5, 6]]);
        assert_eq!(c[6], Some(4.0));
        assert_eq!(c[4], Some(4.0)); // pa pushed right
        assert_eq!(c[3], Some(2.0)); // ts-a centred between 0 and 4
    }

    #[test]
    fn product_ends_that_would_crowd_step_right() {
        // start → ts → branch point, then three branches ending in products
        // 5, 7, 9 (9 on the longest branch); 5 and 9 crowd, 7 does not.
        let paths: Vec<Vec<usize>> =
            vec![vec![0, 1, 2, 3, 4, 5], vec![2, 6, 7], vec![2, 8, 10, 11, 9]];
        let crowd = |a: usize, b: usize| matches!((a.min(b), a.max(b)), (5, 9));
        let c: Vec<f64> = assign(12, &paths, &[], &crowd)
            .into_iter()
            .map(Option::unwrap)
            .collect();
        assert_eq!(c[9], 6.0); // the longest branch's end keeps the last column
        assert_eq!(c[7], 6.0); // no crowding: aligned
        assert_eq!(c[5], 7.0); // one step right
        // Without crowding every end is aligned (as before).
        let c = assign(12, &paths, &[], &|_, _| false);
        assert_eq!((c[5], c[7], c[9]), (Some(6.0), Some(6.0), Some(6.0)));
    }

    #[test]
    fn cycle_falls_back_to_path_order() {
        let c = cols(4, &[&[0, 1, 2, 3, 0]]);
        assert_eq!(c, vec![Some(0.0), Some(1.0), Some(2.0), Some(3.0)]);
        let c = cols(3, &[&[0, 1], &[1, 2, 1]]);
        assert_eq!(c, vec![Some(0.0), Some(1.0), Some(2.0)]);
    }

    #[test]
    fn points_on_no_path_and_empty_input() {
        let c = cols(3, &[&[0, 1]]);
        assert_eq!(c, vec![Some(0.0), Some(1.0), None]);
        assert!(cols(0, &[]).is_empty());
        assert_eq!(cols(1, &[&[0]]), vec![Some(0.0)]);
    }
}
