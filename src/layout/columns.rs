//! Horizontal order of the stationary points, from the graph the paths make.
//!
//! Columns are longest-path layers of the directed graph of consecutive
//! path entries, so a shared prefix is drawn once, branches fan out to the
//! right and rejoining paths meet at the shared state. Final states (sinks)
//! move to the last column of their network, so products line up; a run of
//! points between two branch or end points (e.g. a lone concerted TS spanning
//! a stepwise route) is spread evenly between them instead of hugging the
//! left. A graph with a cycle falls back to the order along each path.

/// Column (possibly fractional) of every point; `None` for points on no
/// path. `paths` holds indices below `n`.
pub fn assign(n: usize, paths: &[Vec<usize>]) -> Vec<Option<f64>> {
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
    let Some(order) = topological(n, &on, &succ, &pred) else {
        return along_paths(n, paths);
    };
    let mut col = vec![0usize; n];
    for &v in &order {
        for &u in &pred[v] {
            col[v] = col[v].max(col[u] + 1);
        }
    }
    // Sinks to the last column of their connected network.
    let comp = components(n, &succ, &pred);
    let mut last = vec![0usize; n];
    for v in 0..n {
        if on[v] {
            last[comp[v]] = last[comp[v]].max(col[v]);
        }
    }
    for v in 0..n {
        if on[v] && succ[v].is_empty() && !pred[v].is_empty() {
            col[v] = last[comp[v]];
        }
    }
    let mut out: Vec<Option<f64>> = (0..n).map(|v| on[v].then_some(col[v] as f64)).collect();
    // Spread runs of pass-through points between their anchors.
    let through = |v: usize| pred[v].len() == 1 && succ[v].len() == 1;
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
        let (a, b) = (col[start] as f64, col[w] as f64);
        let k = run.len() as f64 + 1.0;
        for (i, &r) in run.iter().enumerate() {
            out[r] = Some(a + (b - a) * (i as f64 + 1.0) / k);
        }
    }
    out
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
        assign(n, &paths)
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
