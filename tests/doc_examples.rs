//! Every example in `docs/profile-format.md` is checked, so the format
//! documentation cannot drift from what eyrie actually reads.
//!
//! Fence convention in that document:
//! - ```` ```toml ```` — a complete profile that parses with no errors and no warnings;
//! - ```` ```toml-warning ```` — a complete profile that parses, with at least one warning;
//! - ```` ```toml-invalid ```` — a profile that must be rejected with at least one error;
//! - any other fence (```` ```text ````, …) is not a profile and is skipped.

use eyrie::diag::Source;
use eyrie::profile::parse;

/// (fence info string, 1-based line of the fence, block text).
fn blocks(doc: &str) -> Vec<(String, usize, String)> {
    let mut out = Vec::new();
    let mut current: Option<(String, usize, String)> = None;
    for (n, line) in doc.lines().enumerate() {
        match current.as_mut() {
            None => {
                if let Some(info) = line.strip_prefix("```") {
                    current = Some((info.trim().to_string(), n + 1, String::new()));
                }
            }
            Some((_, _, body)) => {
                if line.trim_start().starts_with("```") {
                    out.push(current.take().expect("inside a block"));
                } else {
                    body.push_str(line);
                    body.push('\n');
                }
            }
        }
    }
    assert!(current.is_none(), "unclosed code fence in the document");
    out
}

#[test]
fn every_profile_example_in_the_format_doc_behaves_as_fenced() {
    let doc = include_str!("../docs/profile-format.md");
    let all = blocks(doc);
    let mut checked = 0;
    let mut failures = Vec::new();
    for (info, line, body) in &all {
        let source = Source {
            name: format!("docs/profile-format.md block at line {line}"),
            text: body.clone(),
        };
        let outcome = parse(body);
        let problem = match (info.as_str(), &outcome) {
            ("toml", Ok(p)) if p.warnings.is_empty() => None,
            ("toml", Ok(p)) => Some(source.render(&p.warnings)),
            ("toml", Err(e)) => Some(source.render(e)),
            ("toml-warning", Ok(p)) if !p.warnings.is_empty() => None,
            ("toml-warning", Ok(_)) => Some("expected a warning, got none".to_string()),
            ("toml-warning", Err(e)) => Some(source.render(e)),
            ("toml-invalid", Err(e)) if e.iter().any(|d| d.is_error()) => None,
            ("toml-invalid", _) => Some("expected an error, but it was accepted".to_string()),
            _ => continue,
        };
        checked += 1;
        if let Some(p) = problem {
            failures.push(format!("```{info} block at line {line}:\n{p}"));
        }
    }
    assert!(checked >= 10, "only {checked} profile examples found");
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn fence_reader_finds_blocks_and_their_kinds() {
    let doc = "text\n```toml\na = 1\n```\n```toml-invalid\nb\n```\n";
    let b = blocks(doc);
    assert_eq!(b.len(), 2);
    assert_eq!(
        (b[0].0.as_str(), b[0].1, b[0].2.as_str()),
        ("toml", 2, "a = 1\n")
    );
    assert_eq!(b[1].0, "toml-invalid");
}
