//! `eyrie convert`: a ratio, an ee/de or a ΔΔG‡ into the other two.

use super::error::CliError;
use eyrie::convert::{Conversion, Given};
use eyrie::format;
use eyrie::units::Temperature;

/// Converts `value` at `temperature` (default 25 °C) and prints it.
pub fn run(value: &str, temperature: Option<Temperature>, json: bool) -> Result<(), CliError> {
    let given = Given::parse(value).map_err(|e| CliError::Usage(e.to_string()))?;
    let t = temperature.unwrap_or_else(|| Temperature::parse("25 C").expect("valid"));
    let c = Conversion::new(given, t);
    if json {
        println!(
            "{}",
            serde_json::to_string_pretty(&c).expect("plain data serialises")
        );
        return Ok(());
    }
    let ratio = if c.ratio < 1e4 {
        format!("{:.1}:1", c.ratio)
    } else {
        format!("{}:1", format::scientific(c.ratio))
    };
    let major = 100.0 * c.ratio / (c.ratio + 1.0);
    println!("at {t}:");
    println!("  ratio      {ratio}  ({major:.1}:{:.1})", 100.0 - major);
    println!("  ee / de    {:.1} %", c.ee_percent);
    println!(
        "  ΔΔG‡       {:.2} kcal/mol = {:.2} kJ/mol",
        c.ddg_kcal_mol, c.ddg_kj_mol
    );
    Ok(())
}
