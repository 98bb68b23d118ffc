//! Property test: no input makes the profile stage panic. Random text and
//! mutated copies of the shipped profiles go through `parse` and through the
//! diagnostic renderer; the result must be a valid model or at least one
//! located error whose span lies inside the text.

use eyrie::diag::Source;
use eyrie::model::Kind;
use eyrie::profile::parse;
use proptest::prelude::*;
use proptest::sample::Index;

const PROFILES: [&str; 4] = [
    include_str!("../profiles/demo.toml"),
    include_str!("../profiles/catalytic-cycle.toml"),
    include_str!("../profiles/conformers.toml"),
    include_str!("../profiles/hartree-absolute.toml"),
];

/// Pieces that are likely to confuse a TOML reader or the validation.
const FRAGMENTS: [&str; 32] = [
    "= ",
    "[",
    "]",
    "[[",
    "]]",
    "\"",
    "'",
    "{",
    "}",
    ",",
    "\n",
    "#",
    "nan",
    "-nan",
    "inf",
    "-inf",
    "-1e400",
    "1e308",
    "0x1F",
    "9999999999999999999999",
    "\"\"",
    "ts",
    "[states]",
    "[ts]",
    "[[path]]",
    "via = []",
    "zero = \"ts\"",
    "g = ",
    "product = true",
    "αβ‡⁻",
    "\u{0}",
    "🧪",
];

/// Parses and renders; checks what a caller relies on.
fn check(text: &str) -> Result<(), TestCaseError> {
    let source = Source {
        name: "input.toml".to_string(),
        text: text.to_string(),
    };
    let diagnostics = match parse(text) {
        Ok(parsed) => {
            let m = &parsed.model;
            for p in m.points() {
                prop_assert!(p.g.is_finite(), "non-finite energy in a model");
            }
            for path in m.paths() {
                prop_assert!(path.via.len() >= 2);
                prop_assert!(path.via.iter().all(|&i| i < m.points().len()));
            }
            for s in m.steps() {
                prop_assert_eq!(m.point(s.from).kind, Kind::Minimum);
                prop_assert_eq!(m.point(s.to).kind, Kind::Minimum);
                if let Some(ts) = s.ts {
                    prop_assert_eq!(m.point(ts).kind, Kind::TransitionState);
                }
            }
            prop_assert!(m.temperature().k() > 0.0);
            prop_assert!(parsed.warnings.iter().all(|w| !w.is_error()));
            parsed.warnings
        }
        Err(diagnostics) => {
            prop_assert!(
                diagnostics.iter().any(|d| d.is_error()),
                "Err without an error"
            );
            diagnostics
        }
    };
    for d in &diagnostics {
        prop_assert!(!d.message.trim().is_empty());
        prop_assert!(
            d.span.start <= d.span.end && d.span.end <= text.len(),
            "span {:?} outside 0..{}",
            d.span,
            text.len()
        );
        for (span, note) in &d.related {
            prop_assert!(span.end <= text.len() && !note.is_empty());
        }
    }
    let rendered = source.render(&diagnostics);
    prop_assert_eq!(rendered.is_empty(), diagnostics.is_empty());
    Ok(())
}

/// One edit of a profile, applied on characters so the text stays UTF-8.
#[derive(Debug, Clone)]
enum Edit {
    DeleteChar(Index),
    InsertChar(Index, char),
    ReplaceChar(Index, char),
    DuplicateChar(Index),
    Splice(Index, usize),
    DeleteLine(Index),
    DuplicateLine(Index),
    SwapLines(Index, Index),
}

fn edit() -> impl Strategy<Value = Edit> {
    prop_oneof![
        any::<Index>().prop_map(Edit::DeleteChar),
        (any::<Index>(), any::<char>()).prop_map(|(i, c)| Edit::InsertChar(i, c)),
        (any::<Index>(), any::<char>()).prop_map(|(i, c)| Edit::ReplaceChar(i, c)),
        any::<Index>().prop_map(Edit::DuplicateChar),
        (any::<Index>(), 0..FRAGMENTS.len()).prop_map(|(i, f)| Edit::Splice(i, f)),
        any::<Index>().prop_map(Edit::DeleteLine),
        any::<Index>().prop_map(Edit::DuplicateLine),
        (any::<Index>(), any::<Index>()).prop_map(|(a, b)| Edit::SwapLines(a, b)),
    ]
}

fn apply(text: &str, edit: &Edit) -> String {
    let mut chars: Vec<char> = text.chars().collect();
    let mut lines: Vec<String> = text.split('\n').map(str::to_string).collect();
    let at = |i: &Index, len: usize| if len == 0 { 0 } else { i.index(len) };
    match edit {
        Edit::DeleteChar(i) if !chars.is_empty() => {
            chars.remove(at(i, chars.len()));
        }
        Edit::InsertChar(i, c) => chars.insert(at(i, chars.len() + 1), *c),
        Edit::ReplaceChar(i, c) if !chars.is_empty() => {
            let k = at(i, chars.len());
            chars[k] = *c;
        }
        Edit::DuplicateChar(i) if !chars.is_empty() => {
            let k = at(i, chars.len());
            chars.insert(k, chars[k]);
        }
        Edit::Splice(i, f) => {
            let k = at(i, chars.len() + 1);
            chars.splice(k..k, FRAGMENTS[*f].chars());
        }
        Edit::DeleteLine(i) => {
            lines.remove(at(i, lines.len()));
            return lines.join("\n");
        }
        Edit::DuplicateLine(i) => {
            let k = at(i, lines.len());
            lines.insert(k, lines[k].clone());
            return lines.join("\n");
        }
        Edit::SwapLines(a, b) => {
            let (a, b) = (at(a, lines.len()), at(b, lines.len()));
            lines.swap(a, b);
            return lines.join("\n");
        }
        _ => {}
    }
    chars.into_iter().collect()
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 400, failure_persistence: None, ..ProptestConfig::default() })]

    #[test]
    fn random_text_never_panics(text in "\\PC{0,300}") {
        check(&text)?;
    }

    #[test]
    fn random_toml_like_text_never_panics(pieces in prop::collection::vec(
        prop_oneof![
            (0..FRAGMENTS.len()).prop_map(|i| FRAGMENTS[i].to_string()),
            "[a-z_-]{1,8}",
            "-?[0-9]{1,4}(\\.[0-9]{1,3})?",
        ],
        0..40,
    )) {
        check(&pieces.join(" "))?;
    }

    #[test]
    fn mutated_profiles_never_panic(which in 0..PROFILES.len(), edits in prop::collection::vec(edit(), 1..6)) {
        let mut text = PROFILES[which].to_string();
        for e in &edits {
            text = apply(&text, e);
        }
        check(&text)?;
    }
}

#[test]
fn unmutated_profiles_pass_the_same_checks() {
    for text in PROFILES {
        assert!(parse(text).is_ok());
        check(text).expect("shipped profile passes");
    }
}
