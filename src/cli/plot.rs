//! `--plot FILE` of `eyrie sweep` and `eyrie simulate`: an XY chart of the
//! command's results, written through the same encoders, page sizes and
//! atomic writer as `eyrie render`. The table or JSON is printed as usual;
//! the chart is an extra.

use super::error::CliError;
use super::files;
use super::render::{self, Format, Size};
use eyrie::layout::{ChartSpec, Style};
use std::path::PathBuf;

/// Chart output options, shared by the commands that draw one.
#[derive(Debug, Clone, clap::Args)]
pub(crate) struct PlotArgs {
    /// Also draw the results as a chart to FILE; its extension chooses the format:
    /// .svg, .png (at --dpi) or .pdf, as for `eyrie render`. The table or JSON is
    /// printed as usual.
    #[arg(long, value_name = "FILE")]
    pub plot: Option<PathBuf>,
    /// Page and type size of the chart, as for `eyrie render`: single (85 × 65 mm,
    /// 7 pt), double (175 × 90 mm, 8 pt), slide or poster.
    #[arg(
        long,
        value_enum,
        default_value = "single",
        value_name = "SIZE",
        requires = "plot"
    )]
    size: Size,
    /// Chart width in mm (default from --size).
    #[arg(long, value_name = "MM", value_parser = render::parse_mm, requires = "plot")]
    width: Option<f64>,
    /// Chart height in mm (default from --size).
    #[arg(long, value_name = "MM", value_parser = render::parse_mm, requires = "plot")]
    height: Option<f64>,
    /// Resolution of a PNG chart in dots per inch.
    #[arg(long, value_name = "N", default_value_t = 600,
          value_parser = clap::value_parser!(u32).range(50..=4800), requires = "plot")]
    dpi: u32,
}

/// A checked chart output: where, in which format, at which size.
#[derive(Debug, Clone)]
pub(crate) struct PlotTarget {
    output: PathBuf,
    format: Format,
    style: Style,
    dpi: u32,
}

impl PlotArgs {
    /// Checks the options before any work is done (a bad extension or size
    /// fails with exit code 2 and writes nothing); `None` without --plot.
    pub fn resolve(&self) -> Result<Option<PlotTarget>, CliError> {
        let Some(output) = &self.plot else {
            return Ok(None);
        };
        let format = Format::of(output)?;
        let mut style = Style::preset(self.size.preset()).expect("every --size names a preset");
        style.width_mm = self.width.unwrap_or(style.width_mm);
        style.height_mm = self.height.unwrap_or(style.height_mm);
        render::check_resolution(format, &style, self.dpi)?;
        Ok(Some(PlotTarget {
            output: output.clone(),
            format,
            style,
            dpi: self.dpi,
        }))
    }
}

impl PlotTarget {
    /// Lays out `spec` and replaces the output file atomically.
    pub fn write(&self, spec: &ChartSpec) -> Result<(), CliError> {
        let scene = eyrie::layout::layout_chart(spec, &self.style);
        files::write_atomic(
            &self.output,
            &render::encode(&scene, self.format, self.dpi)?,
        )?;
        eprintln!("wrote {}", self.output.display());
        Ok(())
    }
}
