//! One formatting rule for every number eyrie shows, so the table, the JSON
//! summary and the figure print the same digits.

/// An energy with a fixed number of decimals; "-0.0" becomes "0.0".
/// `typographic` uses the true minus sign (U+2212) for figures.
pub fn energy(value: f64, decimals: usize, typographic: bool) -> String {
    let text = format!("{value:.decimals$}");
    let text = if text.starts_with('-') && text[1..].chars().all(|c| c == '0' || c == '.') {
        text[1..].to_string()
    } else {
        text
    };
    if typographic {
        text.replacen('-', "\u{2212}", 1)
    } else {
        text
    }
}

/// A positive quantity spanning many decades (a rate constant) with three
/// significant figures: plain between 0.01 and 10 000, otherwise `1.23e-5`.
pub fn scientific(value: f64) -> String {
    if !value.is_finite() {
        return if value.is_nan() {
            "n/a".into()
        } else {
            "∞".into()
        };
    }
    if value == 0.0 {
        return "0".into();
    }
    let magnitude = value.abs();
    if (0.01..10_000.0).contains(&magnitude) {
        let decimals = (2 - magnitude.log10().floor() as i32).max(0) as usize;
        format!("{value:.decimals$}")
    } else {
        let text = format!("{value:.2e}");
        // Rust writes 1.23e5; chemists read 1.23e+5 and 1.23e-5 equally well, keep it.
        text
    }
}

/// [`scientific`] as a figure prints it, in the label markup
/// (`layout::markup`): the same digits, with "2.09e-3" written
/// "2.09 × 10^-3" (drawn as 2.09 × 10⁻³) and the true minus sign, because a
/// printed figure shows no computer notation.
pub fn scientific_markup(value: f64) -> String {
    // The markup turns the exponent's "-" into a superscript minus; the
    // mantissa's sign is written as the minus sign here.
    let text = scientific(value);
    let (mantissa, power) = match text.split_once('e') {
        Some((m, e)) => (m, format!(" × 10^{e}")),
        None => (text.as_str(), String::new()),
    };
    format!("{}{power}", mantissa.replacen('-', "\u{2212}", 1))
}

/// A duration in the unit a chemist would say it in: "3.2 ps", "45 s",
/// "4.6 min", "2.2 h", "3.1 d", "12 years"; two or three significant figures.
pub fn duration(seconds: f64) -> String {
    if !seconds.is_finite() {
        return "never".into();
    }
    const MINUTE: f64 = 60.0;
    const HOUR: f64 = 3600.0;
    const DAY: f64 = 86_400.0;
    const YEAR: f64 = 365.25 * DAY;
    let (value, unit) = if seconds < 1e-12 {
        (seconds * 1e15, "fs")
    } else if seconds < 1e-9 {
        (seconds * 1e12, "ps")
    } else if seconds < 1e-6 {
        (seconds * 1e9, "ns")
    } else if seconds < 1e-3 {
        (seconds * 1e6, "µs")
    } else if seconds < 1.0 {
        (seconds * 1e3, "ms")
    } else if seconds < 100.0 {
        (seconds, "s")
    } else if seconds < 100.0 * MINUTE {
        (seconds / MINUTE, "min")
    } else if seconds < 48.0 * HOUR {
        (seconds / HOUR, "h")
    } else if seconds < YEAR {
        (seconds / DAY, "d")
    } else {
        let years = seconds / YEAR;
        if years >= 1e4 {
            return format!("{years:.1e} years");
        }
        (years, "years")
    };
    let decimals = if value < 10.0 { 1 } else { 0 };
    format!("{value:.decimals$} {unit}")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn energies_have_one_rule() {
        assert_eq!(energy(-15.84, 1, false), "-15.8");
        assert_eq!(energy(-15.84, 1, true), "\u{2212}15.8");
        assert_eq!(energy(-0.04, 1, false), "0.0");
        assert_eq!(energy(27.25, 2, false), "27.25");
    }

    #[test]
    fn rate_constants_keep_three_figures() {
        assert_eq!(scientific(290543.5), "2.91e5");
        assert_eq!(scientific(0.5123), "0.512");
        assert_eq!(scientific(12.345), "12.3");
        assert_eq!(scientific(3.1e-12), "3.10e-12");
        assert_eq!(scientific(0.0), "0");
    }

    #[test]
    fn figures_write_powers_of_ten() {
        // Same three figures as `scientific`; the exponent as a superscript.
        assert_eq!(scientific_markup(2.09e-3), "2.09 × 10^-3");
        assert_eq!(scientific_markup(290543.5), "2.91 × 10^5");
        assert_eq!(scientific_markup(-3.1e-12), "\u{2212}3.10 × 10^-12");
        assert_eq!(scientific_markup(0.5123), "0.512");
        let runs = crate::layout::markup::parse(&scientific_markup(2.09e-3));
        assert_eq!(crate::layout::rich::plain(&runs), "2.09 × 10\u{2212}3");
        assert_eq!(runs.last().unwrap().script, crate::layout::Script::Super);
    }

    #[test]
    fn durations_read_like_a_chemist_says_them() {
        assert_eq!(duration(1.32e-13), "132 fs");
        assert_eq!(duration(45.0), "45 s");
        assert_eq!(duration(276.0), "4.6 min");
        assert_eq!(duration(3600.0 * 2.2), "2.2 h");
        assert_eq!(duration(86_400.0 * 3.1), "3.1 d");
        assert_eq!(duration(86_400.0 * 365.25 * 12.0), "12 years");
        assert_eq!(duration(f64::INFINITY), "never");
    }
}
