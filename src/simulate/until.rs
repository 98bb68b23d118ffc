//! When a simulation stops: after a time, at a conversion of the starting
//! material, or (by default) at 99 % conversion or equilibrium, whichever
//! comes first.

use super::SimulateError;

/// The stop rule.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub enum Until {
    /// 99 % conversion, equilibrium, or the steady state of a cycle, whichever first.
    #[default]
    Default,
    /// A time in seconds.
    Time(f64),
    /// A conversion of the starting material, as a fraction (0.99 for 99 %),
    /// or equilibrium if that comes first.
    Conversion(f64),
}

impl Until {
    /// Reads `2 h`, `30 min`, `1e4 s`, `500 ms`, `3 d` or `99%`.
    pub fn parse(text: &str) -> Result<Until, SimulateError> {
        let bad = |why: &str| SimulateError::BadUntil {
            text: text.to_string(),
            why: why.to_string(),
        };
        let t = text.trim();
        if let Some(number) = t.strip_suffix('%') {
            let p: f64 = number
                .trim()
                .parse()
                .map_err(|_| bad("the conversion is not a number"))?;
            if !(p > 0.0 && p < 100.0) {
                return Err(bad("a conversion lies between 0 and 100 % (exclusive)"));
            }
            return Ok(Until::Conversion(p / 100.0));
        }
        let split = t
            .find(|c: char| c.is_ascii_alphabetic() && c != 'e' && c != 'E')
            .ok_or_else(|| bad("give a unit: s, min, h or d (e.g. 2 h), or a conversion (99%)"))?;
        let (number, unit) = t.split_at(split);
        let value: f64 = number
            .trim()
            .parse()
            .map_err(|_| bad("the time is not a number"))?;
        let scale = match unit.trim() {
            "ms" => 1e-3,
            "s" | "sec" => 1.0,
            "min" => 60.0,
            "h" => 3600.0,
            "d" => 86400.0,
            _ => return Err(bad("unknown time unit (use ms, s, min, h or d)")),
        };
        let seconds = value * scale;
        if !(seconds.is_finite() && seconds > 0.0) {
            return Err(bad("the time must be positive and finite"));
        }
        Ok(Until::Time(seconds))
    }
}

#[cfg(test)]
mod tests {
    use super::Until;

    #[test]
    fn reads_times_and_conversions() {
        assert_eq!(Until::parse("2 h").unwrap(), Until::Time(7200.0));
        assert_eq!(Until::parse("30 min").unwrap(), Until::Time(1800.0));
        assert_eq!(Until::parse("1e4 s").unwrap(), Until::Time(1e4));
        assert_eq!(Until::parse("1.5e-3s").unwrap(), Until::Time(1.5e-3));
        assert_eq!(Until::parse("99%").unwrap(), Until::Conversion(0.99));
        for bad in ["", "2", "2 years", "-1 s", "100%", "0%", "x%", "inf s"] {
            assert!(Until::parse(bad).is_err(), "{bad}");
        }
    }
}
