//! "Did you mean …?" suggestions for misspelt keys and ids.
//!
//! A typo must never be silently ignored, and the fastest fix is the right
//! spelling, so every "unknown" error offers the nearest known name.

/// Edit distance in characters (not bytes), so ids with Greek letters or
/// primes count one edit per symbol. Swapping two neighbouring characters
/// counts as one edit (optimal string alignment), the commonest typing slip
/// ("lable" for "label").
pub(crate) fn edit_distance(a: &str, b: &str) -> usize {
    let a: Vec<char> = a.chars().collect();
    let b: Vec<char> = b.chars().collect();
    let width = b.len() + 1;
    let mut d = vec![0usize; (a.len() + 1) * width];
    for (i, row) in d.chunks_mut(width).enumerate() {
        row[0] = i;
    }
    for (j, cell) in d.iter_mut().enumerate().take(width) {
        *cell = j;
    }
    for i in 1..=a.len() {
        for j in 1..=b.len() {
            let cost = usize::from(a[i - 1] != b[j - 1]);
            let mut best = (d[(i - 1) * width + j] + 1)
                .min(d[i * width + j - 1] + 1)
                .min(d[(i - 1) * width + j - 1] + cost);
            if i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1] {
                best = best.min(d[(i - 2) * width + j - 2] + 1);
            }
            d[i * width + j] = best;
        }
    }
    d[a.len() * width + b.len()]
}

/// The candidate closest to `word`, if it is close enough to be a plausible
/// typo: at most a third of the word's length in edits (at least one), or a
/// difference of case only.
pub(crate) fn nearest<'a>(
    word: &str,
    candidates: impl IntoIterator<Item = &'a str>,
) -> Option<&'a str> {
    let limit = (word.chars().count() / 3).max(1);
    let lower = word.to_lowercase();
    let mut best: Option<(usize, &'a str)> = None;
    for candidate in candidates {
        let distance = if candidate.to_lowercase() == lower {
            0
        } else {
            edit_distance(word, candidate)
        };
        if distance <= limit && best.is_none_or(|(d, _)| distance < d) {
            best = Some((distance, candidate));
        }
    }
    best.map(|(_, c)| c)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn distance_counts_insertions_deletions_and_substitutions() {
        assert_eq!(edit_distance("", ""), 0);
        assert_eq!(edit_distance("label", "label"), 0);
        assert_eq!(edit_distance("lable", "label"), 1);
        assert_eq!(edit_distance("tempreature", "temperature"), 1);
        assert_eq!(edit_distance("kitten", "sitting"), 3);
        assert_eq!(edit_distance("ts-elm", "ts-elim"), 1);
        assert_eq!(edit_distance("α", "β"), 1);
        assert_eq!(edit_distance("abc", ""), 3);
    }

    #[test]
    fn nearest_picks_the_closest_plausible_candidate() {
        let ids = ["ts-elim", "ts-ion", "ts-trap"];
        assert_eq!(nearest("ts-elm", ids), Some("ts-elim"));
        assert_eq!(nearest("TS-ION", ids), Some("ts-ion"));
        assert_eq!(nearest("product", ids), None);
        assert_eq!(nearest("unti", ["unit", "title"]), Some("unit"));
    }
}
