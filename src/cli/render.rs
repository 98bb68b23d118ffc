//! `eyrie render`: the reaction-coordinate diagram of a profile, as SVG, PNG
//! or PDF at a journal's column width. The figure options are shared with
//! `eyrie watch`.

use super::error::CliError;
use super::files;
use eyrie::layout::Style;
use eyrie::model::Model;
use std::path::{Path, PathBuf};

/// A figure file format.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub(crate) enum Format {
    /// Vector graphics with editable text.
    Svg,
    /// Pixels, at --dpi.
    Png,
    /// Vector graphics with the font embedded.
    Pdf,
}

impl Format {
    fn extension(self) -> &'static str {
        match self {
            Format::Svg => "svg",
            Format::Png => "png",
            Format::Pdf => "pdf",
        }
    }

    /// The format an output file's extension names.
    fn of(path: &Path) -> Result<Format, CliError> {
        let extension = path
            .extension()
            .map(|e| e.to_string_lossy().to_ascii_lowercase())
            .unwrap_or_default();
        match extension.as_str() {
            "svg" => Ok(Format::Svg),
            "png" => Ok(Format::Png),
            "pdf" => Ok(Format::Pdf),
            _ => Err(CliError::Usage(format!(
                "cannot write '{}': eyrie writes figures as .svg, .png or .pdf; \
                 name the output with one of these extensions",
                path.display()
            ))),
        }
    }
}

/// Page-size presets after the usual two-column journal page. The journal
/// widths in the help are as their guides for authors give them (from memory:
/// the help tells users to check their journal's guide).
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub(crate) enum Size {
    /// 85 × 65 mm, one column.
    Single,
    /// 175 × 100 mm, the full text width.
    Double,
}

impl Size {
    fn mm(self) -> (f64, f64) {
        match self {
            Size::Single => (85.0, 65.0),
            Size::Double => (175.0, 100.0),
        }
    }
}

/// Where and how to draw the figure (shared by `render` and `watch`).
#[derive(Debug, clap::Args)]
pub(crate) struct FigureOptions {
    /// Where to write the figure. The extension chooses the format: .svg (vector,
    /// text stays editable), .png (pixels, at --dpi) or .pdf (vector, font
    /// embedded). Default: the profile's name with the --format extension, in the
    /// current folder. The file is replaced only once the figure is complete.
    #[arg(short, long, value_name = "FILE")]
    output: Option<PathBuf>,
    /// Format of the default output file when -o is not given: svg, png or pdf.
    #[arg(long, value_enum, value_name = "FORMAT", conflicts_with = "output")]
    format: Option<Format>,
    /// Page size at the printed size: "single" is 85 × 65 mm, one column of a
    /// two-column journal page (ACS 3.25 in ≈ 83 mm, RSC 83 mm); "double" is
    /// 175 × 100 mm, the full text width (ACS 7 in ≈ 178 mm, RSC 171 mm). Check
    /// your journal's guide for authors. --width and --height override it.
    #[arg(long, value_enum, default_value = "single", value_name = "PRESET")]
    size: Size,
    /// Figure width in mm (default from --size: 85 mm). Type stays 7–8 pt, so a
    /// wider figure has more room, not bigger letters.
    #[arg(long, value_name = "MM", value_parser = parse_mm)]
    width: Option<f64>,
    /// Figure height in mm (default from --size: 65 mm).
    #[arg(long, value_name = "MM", value_parser = parse_mm)]
    height: Option<f64>,
    /// Resolution of a PNG in dots per inch; journals ask for 300 to 1200 for
    /// line art with text. The PNG is width / 25.4 × dpi pixels wide (85 mm at
    /// 600 dpi: 2008 px).
    #[arg(long, value_name = "N", default_value_t = 600,
          value_parser = clap::value_parser!(u32).range(50..=4800))]
    dpi: u32,
}

/// The figure options resolved against an input: file, format, page and dpi.
#[derive(Debug, Clone)]
pub(crate) struct Target {
    /// The file to write.
    pub output: PathBuf,
    format: Format,
    style: Style,
    dpi: u32,
}

impl FigureOptions {
    /// Checks the options and names the output for `input`; fails with exit
    /// code 2 before any work is done.
    pub fn resolve(&self, input: &Path) -> Result<Target, CliError> {
        let (output, format) = match &self.output {
            Some(path) => (path.clone(), Format::of(path)?),
            None => {
                let format = self.format.unwrap_or(Format::Svg);
                (default_output(input, format), format)
            }
        };
        let (w, h) = self.size.mm();
        let style = Style {
            width_mm: self.width.unwrap_or(w),
            height_mm: self.height.unwrap_or(h),
            ..Style::default()
        };
        if format == Format::Png {
            let (px_w, px_h) =
                eyrie::render::pixel_size(style.width_mm, style.height_mm, f64::from(self.dpi));
            if px_w * px_h > eyrie::render::MAX_PIXELS {
                return Err(CliError::Usage(format!(
                    "a {} × {} mm PNG at {} dpi would be {px_w} × {px_h} pixels, more than \
                     eyrie draws ({} million); lower --dpi",
                    style.width_mm,
                    style.height_mm,
                    self.dpi,
                    eyrie::render::MAX_PIXELS / 1_000_000
                )));
            }
        } else if self.dpi != 600 {
            eprintln!(
                "note: --dpi applies to PNG only; {} is vector and has no resolution",
                format.extension().to_uppercase()
            );
        }
        Ok(Target {
            output,
            format,
            style,
            dpi: self.dpi,
        })
    }
}

impl Target {
    /// The figure of `model` as the bytes of the output file.
    pub fn draw(&self, model: &Model) -> Result<Vec<u8>, CliError> {
        let spec = eyrie::figure::diagram_spec(model, &eyrie::figure::FigureOptions::default());
        let scene = eyrie::layout::layout(&spec, &self.style);
        let bytes = match self.format {
            Format::Svg => Ok(eyrie::render::to_svg(&scene).into_bytes()),
            Format::Png => eyrie::render::to_png(&scene, f64::from(self.dpi)),
            Format::Pdf => eyrie::render::to_pdf(&scene),
        };
        bytes.map_err(|e| CliError::Usage(format!("cannot draw the figure: {e}")))
    }

    /// Draws `model` and replaces the output file atomically.
    pub fn write(&self, model: &Model) -> Result<(), CliError> {
        files::write_atomic(&self.output, &self.draw(model)?)
    }
}

/// Renders `path` as `figure` asks.
pub fn run(
    path: &Path,
    figure: &FigureOptions,
    conditions: &super::Conditions,
) -> Result<(), CliError> {
    let target = figure.resolve(path)?;
    let (parsed, warnings) = files::load(path)?;
    eprint!("{warnings}");
    target.write(&conditions.apply(parsed.model))?;
    eprintln!("wrote {}", target.output.display());
    Ok(())
}

fn default_output(input: &Path, format: Format) -> PathBuf {
    let stem = input
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| "figure".into());
    PathBuf::from(format!("{stem}.{}", format.extension()))
}

/// A length in mm for a page side: a number from 20 to 1000.
fn parse_mm(text: &str) -> Result<f64, String> {
    let value: f64 = text
        .trim()
        .trim_end_matches("mm")
        .trim()
        .parse()
        .map_err(|_| format!("'{text}' is not a length in mm (write e.g. 85)"))?;
    if (20.0..=1000.0).contains(&value) {
        Ok(value)
    } else {
        Err(format!(
            "{value} mm is outside 20–1000 mm (a journal column is about 85 mm)"
        ))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn format_comes_from_the_extension() {
        assert_eq!(Format::of(Path::new("a/fig.PNG")).unwrap(), Format::Png);
        assert_eq!(Format::of(Path::new("fig.pdf")).unwrap(), Format::Pdf);
        let e = Format::of(Path::new("fig.jpg")).unwrap_err().to_string();
        assert!(e.contains(".svg, .png or .pdf"), "{e}");
        assert!(Format::of(Path::new("fig")).is_err());
    }

    #[test]
    fn lengths_in_mm() {
        assert_eq!(parse_mm("85").unwrap(), 85.0);
        assert_eq!(parse_mm("170 mm").unwrap(), 170.0);
        assert!(parse_mm("5").is_err());
        assert!(parse_mm("wide").is_err());
    }
}
