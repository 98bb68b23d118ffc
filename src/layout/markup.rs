//! The label markup: a few plain-keyboard signs for what chemists write in
//! labels (H_2O, Nu^-, *cis*, :alpha:, :ddag:), parsed into styled runs.
//!
//! Rules (documented with examples in `docs/figures.md`):
//! - `_x` subscript: a run of digits (`C_10`), else one character, or `_{…}`;
//! - `^x` superscript: digits with an optional sign (`^2+`), a sign with
//!   optional digits (`^-`, `^-1`), one character, or `^{…}`; a `-` in a superscript becomes the minus sign;
//! - `*…*` italic (on one line, not empty);
//! - `:name:` a named symbol (Greek letters, `ddag` ‡, `eq` ⇌, …);
//! - `\` before any character sets that character literally.
//!
//! Anything that does not match a rule is kept literally, so no label can
//! fail: unknown names, a lone `*`, an unclosed `{` all print as typed.

use super::scene::{Run, Script};

/// Named symbols, `:name:` → character.
pub const SYMBOLS: &[(&str, &str)] = &[
    ("alpha", "α"),
    ("beta", "β"),
    ("gamma", "γ"),
    ("delta", "δ"),
    ("epsilon", "ε"),
    ("zeta", "ζ"),
    ("eta", "η"),
    ("theta", "θ"),
    ("kappa", "κ"),
    ("lambda", "λ"),
    ("mu", "μ"),
    ("nu", "ν"),
    ("xi", "ξ"),
    ("pi", "π"),
    ("rho", "ρ"),
    ("sigma", "σ"),
    ("tau", "τ"),
    ("phi", "φ"),
    ("chi", "χ"),
    ("psi", "ψ"),
    ("omega", "ω"),
    ("Gamma", "Γ"),
    ("Delta", "Δ"),
    ("Theta", "Θ"),
    ("Lambda", "Λ"),
    ("Xi", "Ξ"),
    ("Pi", "Π"),
    ("Sigma", "Σ"),
    ("Phi", "Φ"),
    ("Psi", "Ψ"),
    ("Omega", "Ω"),
    ("ddag", "‡"),
    ("dag", "†"),
    ("eq", "⇌"),
    ("to", "→"),
    ("deg", "°"),
    ("dot", "·"),
    ("pm", "±"),
    ("times", "×"),
    ("minus", "−"),
];

/// The symbol called `name`, if it is one.
fn symbol(name: &str) -> Option<&'static str> {
    SYMBOLS.iter().find(|(n, _)| *n == name).map(|(_, s)| *s)
}

/// True when `label` contains no markup (it renders as typed).
pub fn is_plain(label: &str) -> bool {
    let runs = parse(label);
    runs.len() <= 1 && runs.iter().all(|r| r.is_plain() && r.text == label)
}

/// Parses `label` into runs; adjacent runs of the same style are merged and
/// empty runs dropped. Never fails: what is not markup is text.
pub fn parse(label: &str) -> Vec<Run> {
    let chars: Vec<char> = label.chars().collect();
    let mut out = Runs::default();
    let mut italic = false;
    let mut i = 0;
    while i < chars.len() {
        let c = chars[i];
        match c {
            '\\' if i + 1 < chars.len() => {
                out.push(chars[i + 1], Script::Normal, italic);
                i += 2;
            }
            '_' | '^' => {
                let script = if c == '_' { Script::Sub } else { Script::Super };
                match script_body(&chars, i + 1, script) {
                    Some((body, next)) => {
                        for b in body {
                            let b = if script == Script::Super && b == '-' {
                                '−'
                            } else {
                                b
                            };
                            out.push(b, script, italic);
                        }
                        i = next;
                    }
                    None => {
                        out.push(c, Script::Normal, italic);
                        i += 1;
                    }
                }
            }
            '*' => {
                // Opens only when a closing star follows with text between;
                // closes an open italic run.
                if italic {
                    italic = false;
                    i += 1;
                } else if closing_star(&chars, i + 1).is_some() {
                    italic = true;
                    i += 1;
                } else {
                    out.push(c, Script::Normal, italic);
                    i += 1;
                }
            }
            ':' => match named(&chars, i + 1) {
                Some((s, next)) => {
                    for ch in s.chars() {
                        out.push(ch, Script::Normal, italic);
                    }
                    i = next;
                }
                None => {
                    out.push(c, Script::Normal, italic);
                    i += 1;
                }
            },
            _ => {
                out.push(c, Script::Normal, italic);
                i += 1;
            }
        }
    }
    out.0
}

/// Collects runs, merging a character into the last run when styles agree.
#[derive(Default)]
struct Runs(Vec<Run>);

impl Runs {
    fn push(&mut self, c: char, script: Script, italic: bool) {
        match self.0.last_mut() {
            Some(r) if r.script == script && r.italic == italic => r.text.push(c),
            _ => self.0.push(Run {
                text: c.to_string(),
                script,
                italic,
            }),
        }
    }
}

/// The characters of a sub/superscript starting at `start`, and the index
/// after it; `None` when nothing follows (the sign is then literal).
fn script_body(chars: &[char], start: usize, script: Script) -> Option<(Vec<char>, usize)> {
    let first = *chars.get(start)?;
    if first == '{' {
        let mut body = Vec::new();
        let mut j = start + 1;
        while j < chars.len() {
            match chars[j] {
                '}' => return (!body.is_empty()).then_some((body, j + 1)),
                '\\' if j + 1 < chars.len() => {
                    body.push(chars[j + 1]);
                    j += 2;
                }
                '{' => return None,
                ch => {
                    body.push(ch);
                    j += 1;
                }
            }
        }
        return None; // unclosed: literal
    }
    if first.is_whitespace() {
        return None;
    }
    if first.is_ascii_digit() {
        let mut j = start;
        while j < chars.len() && chars[j].is_ascii_digit() {
            j += 1;
        }
        if script == Script::Super && matches!(chars.get(j), Some('+') | Some('-')) {
            j += 1;
        }
        return Some((chars[start..j].to_vec(), j));
    }
    if matches!(first, '+' | '-') {
        // A sign with digits after it ("mol^-1") is one superscript.
        let mut j = start + 1;
        while j < chars.len() && chars[j].is_ascii_digit() {
            j += 1;
        }
        return Some((chars[start..j].to_vec(), j));
    }
    Some((vec![first], start + 1))
}

/// Index of the star closing an italic run opened before `start`, if the run
/// is non-empty and on the same line.
fn closing_star(chars: &[char], start: usize) -> Option<usize> {
    let mut j = start;
    while j < chars.len() {
        match chars[j] {
            '\\' => j += 2,
            '*' => return (j > start).then_some(j),
            '\n' => return None,
            _ => j += 1,
        }
    }
    None
}

/// A known `name:` starting at `start` → (symbol, index after the colon).
fn named(chars: &[char], start: usize) -> Option<(&'static str, usize)> {
    let mut j = start;
    while j < chars.len() && chars[j].is_ascii_alphabetic() && j - start < 12 {
        j += 1;
    }
    if j == start || chars.get(j) != Some(&':') {
        return None;
    }
    let name: String = chars[start..j].iter().collect();
    symbol(&name).map(|s| (s, j + 1))
}

/// The runs' characters without styling (for search, titles, tests).
pub fn plain_text(runs: &[Run]) -> String {
    runs.iter().map(|r| r.text.as_str()).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn styled(runs: &[Run]) -> String {
        runs.iter()
            .map(|r| {
                let s = match r.script {
                    Script::Normal => "",
                    Script::Sub => "_",
                    Script::Super => "^",
                };
                let i = if r.italic { "i" } else { "" };
                format!("[{s}{i}{}]", r.text)
            })
            .collect()
    }

    #[test]
    fn chemistry_reads_naturally() {
        assert_eq!(styled(&parse("H_2O")), "[H][_2][O]");
        assert_eq!(styled(&parse("C_10H_22")), "[C][_10][H][_22]");
        assert_eq!(styled(&parse("CH_3^+")), "[CH][_3][^+]");
        assert_eq!(styled(&parse("Nu^-")), "[Nu][^−]");
        assert_eq!(styled(&parse("[M]^2+")), "[[M]][^2+]");
        assert_eq!(styled(&parse("Fe^{III}")), "[Fe][^III]");
        assert_eq!(styled(&parse("s^-1")), "[s][^−1]");
        assert_eq!(styled(&parse("*cis*-adduct")), "[icis][-adduct]");
        assert_eq!(styled(&parse("TS:ddag:")), "[TS‡]");
        assert_eq!(styled(&parse(":Delta:G")), "[ΔG]");
    }

    #[test]
    fn plain_labels_stay_plain() {
        for s in [
            "TS-recombination",
            "[M]·substrate",
            "10:1 ratio",
            "a:b:c",
            "x + y",
        ] {
            assert!(is_plain(s), "{s}");
            assert_eq!(plain_text(&parse(s)), s);
        }
        assert!(!is_plain("H_2O"));
    }

    #[test]
    fn escapes_set_markup_signs_literally() {
        assert_eq!(styled(&parse(r"a\_b")), "[a_b]");
        assert_eq!(styled(&parse(r"\*x\*")), "[*x*]");
        assert_eq!(styled(&parse(r"\:alpha:")), "[:alpha:]");
        assert_eq!(styled(&parse(r"\\")), r"[\]");
        assert_eq!(styled(&parse(r"end\")), r"[end\]");
    }

    #[test]
    fn unbalanced_or_unknown_markup_is_literal() {
        for (input, expected) in [
            ("a_", "[a_]"),
            ("a^", "[a^]"),
            ("x_{12", "[x_{12]"),
            ("x^{}", "[x^{}]"),
            ("x_ y", "[x_ y]"),
            ("*lone", "[*lone]"),
            ("**", "[**]"),
            (":foo:", "[:foo:]"),
            (":alpha", "[:alpha]"),
            ("x_{a{b}}", "[x_{a{b}}]"),
        ] {
            assert_eq!(styled(&parse(input)), expected, "{input}");
        }
    }

    #[test]
    fn hostile_input_never_panics_and_keeps_characters() {
        let nasty = [
            "_^*:\\{}",
            "^{^{^{",
            "*_*_*",
            "\\",
            "::::",
            "<script>_&^'\"",
            "é_ü^ß*ö*",
        ];
        for s in nasty {
            let runs = parse(s);
            assert!(runs.iter().all(|r| !r.text.is_empty()), "{s}");
        }
        // Every character of an arbitrary byte soup survives in some form.
        let soup: String = (0u32..300).filter_map(char::from_u32).collect();
        let _ = parse(&soup);
    }
}
