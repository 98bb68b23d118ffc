//! The few XML-writing helpers SVG output needs: escaping and number
//! formatting. Written here rather than taken from a crate so that hostile
//! labels are escaped everywhere (text and attributes alike) and nothing
//! adds whitespace inside text.

/// Appends `s` escaped for use in text content or a double-quoted attribute.
/// Characters XML 1.0 forbids become U+FFFD; tabs and line breaks become
/// character references so attribute values keep them.
pub fn escape_into(out: &mut String, s: &str) {
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            '\t' => out.push_str("&#9;"),
            '\n' => out.push_str("&#10;"),
            '\r' => out.push_str("&#13;"),
            c if is_xml_char(c) => out.push(c),
            _ => out.push('\u{FFFD}'),
        }
    }
}

/// `s` escaped (see [`escape_into`]).
pub fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    escape_into(&mut out, s);
    out
}

/// True for characters allowed in an XML 1.0 document.
pub(super) fn is_xml_char(c: char) -> bool {
    matches!(c, '\u{20}'..='\u{D7FF}' | '\u{E000}'..='\u{FFFD}' | '\u{10000}'..='\u{10FFFF}')
}

/// A coordinate with three decimals (1 µm at mm units): fixed, so the same
/// scene always gives the same bytes; "-0.000" is written "0.000".
pub fn num(v: f64) -> String {
    let v = if v.is_finite() { v } else { 0.0 };
    let s = format!("{v:.3}");
    if s == "-0.000" { "0.000".into() } else { s }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn escapes_markup_and_quotes() {
        assert_eq!(
            escape(r#"<script>alert("x")</script> & 'y'"#),
            "&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &apos;y&apos;"
        );
        assert_eq!(escape("ΔG‡ kcal mol⁻¹"), "ΔG‡ kcal mol⁻¹");
        assert_eq!(escape("a\u{1}b\u{FFFF}"), "a\u{FFFD}b\u{FFFD}");
        assert_eq!(escape("a\nb"), "a&#10;b");
    }

    #[test]
    fn numbers_are_fixed() {
        assert_eq!(num(1.0), "1.000");
        assert_eq!(num(-0.0001), "0.000");
        assert_eq!(num(12.34567), "12.346");
        assert_eq!(num(f64::NAN), "0.000");
    }
}
