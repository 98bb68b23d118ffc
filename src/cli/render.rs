//! `eyrie render`: the reaction-coordinate diagram of a profile, as SVG, PNG
//! or PDF at a journal's column width. The figure options are shared with
//! `eyrie watch`.

use super::error::CliError;
use super::files;
use eyrie::figure::AnnotationKind;
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
    pub(crate) fn of(path: &Path) -> Result<Format, CliError> {
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

/// Page and type sizes, after the usual two-column journal page. The
/// journal widths in the help are as their guides for authors give them (from
/// memory: the help tells users to check their journal's guide).
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub(crate) enum Size {
    /// 85 × 65 mm, 7 pt type: one column.
    Single,
    /// 175 × 90 mm, 8 pt type: the full text width.
    Double,
    /// 240 × 135 mm, 14 pt type, heavier lines: a 16:9 slide.
    Slide,
    /// 300 × 200 mm, 22 pt type, heavy lines: a poster panel.
    Poster,
}

impl Size {
    /// The layout preset (`layout::PRESETS`) this size names.
    pub(crate) fn preset(self) -> &'static str {
        match self {
            Size::Single => "article",
            Size::Double => "article-wide",
            Size::Slide => "slide",
            Size::Poster => "poster",
        }
    }
}

/// How the connectors between bars are drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub(crate) enum Connectors {
    /// Dashed straight lines from bar end to bar end.
    Straight,
    /// Smooth curves, level at every bar (no overshoot between them).
    Smooth,
}

/// Where and how to draw the figure (shared by `render` and `watch`).
#[derive(Debug, Clone, clap::Args)]
pub(crate) struct FigureOptions {
    /// Where to write the figure. The extension chooses the format: .svg (vector,
    /// text stays editable), .png (pixels, at --dpi) or .pdf (vector, font
    /// embedded). Default: the profile's name with the --format extension, in the
    /// current folder. The file is replaced only once the figure is complete.
    #[arg(short, long, value_name = "FILE")]
    output: Option<PathBuf>,
    /// Format of the default output file when -o is not given (or names a folder
    /// for several profiles): svg, png or pdf.
    #[arg(long, value_enum, value_name = "FORMAT")]
    format: Option<Format>,
    /// Page and type size at the printed size: "single" is 85 × 65 mm with 7 pt
    /// type, one column of a two-column journal page (ACS 3.25 in ≈ 83 mm, RSC
    /// 83 mm); "double" is 175 × 90 mm with 8 pt type, the full text width (ACS
    /// 7 in ≈ 178 mm, RSC 171 mm); "slide" 240 × 135 mm; "poster" 300 × 200 mm.
    /// Check your journal's guide for authors. --width and --height override the
    /// page size.
    #[arg(long, value_enum, default_value = "single", value_name = "SIZE")]
    size: Size,
    /// Figure width in mm (default from --size: 85 mm). The type keeps its size,
    /// so a wider figure has more room, not bigger letters.
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
    /// Numbers computed from the profile to draw on the figure, comma-separated:
    /// "barriers" (ΔG‡ arrow of each path's apparent barrier), "selectivity"
    /// (ΔΔG‡ bracket between the competing TSs with the predicted ratio),
    /// "rate-determining" (shade the states that set the slowest path), "span"
    /// (energetic span δE and TOF of each catalytic cycle), or "all".
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    annotate: Vec<String>,
    /// Connectors between the bars: straight (dashed lines) or smooth (curves
    /// through each TS, level at every bar).
    #[arg(long, value_enum, default_value = "straight", value_name = "STYLE")]
    connectors: Connectors,
    /// Draw a thin line at zero energy.
    #[arg(long)]
    zero_line: bool,
    /// Cut the energy axis when a state lies far below the rest (e.g. a very
    /// exergonic product), so the barriers keep their room.
    #[arg(long)]
    axis_break: bool,
    /// Decimals of every energy on the figure (default: 1 for kcal/mol and
    /// kJ/mol, 2 for eV, 4 for hartree).
    #[arg(long, value_name = "N", value_parser = clap::value_parser!(u8).range(0..=6))]
    decimals: Option<u8>,
    /// Draw variants ([[variant]] blocks) over the profile on the same axes, each
    /// in its own colour and dash with a legend entry: their names,
    /// comma-separated, or "all". Only energies that differ from the profile's
    /// get a bar and a number.
    #[arg(long, value_name = "NAMES", value_delimiter = ',')]
    variants: Vec<String>,
}

/// The figure options resolved against an input: file, format, content,
/// page and dpi.
#[derive(Debug, Clone)]
pub(crate) struct Target {
    /// The file to write.
    pub output: PathBuf,
    format: Format,
    content: eyrie::figure::FigureOptions,
    style: Style,
    dpi: u32,
    /// Variant names to overlay, as given ("all" for every one).
    variants: Vec<String>,
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
        let content = eyrie::figure::FigureOptions {
            annotations: annotations(&self.annotate)?,
            connector: match self.connectors {
                Connectors::Straight => eyrie::layout::Connector::Straight,
                Connectors::Smooth => eyrie::layout::Connector::Smooth,
            },
            zero_line: self.zero_line,
            axis_break: self.axis_break,
            decimals: self.decimals.map(usize::from),
            preset: self.size.preset().into(),
            variants: Vec::new(),
        };
        let mut style = content.style().map_err(CliError::Usage)?;
        style.width_mm = self.width.unwrap_or(style.width_mm);
        style.height_mm = self.height.unwrap_or(style.height_mm);
        check_resolution(format, &style, self.dpi)?;
        Ok(Target {
            output,
            format,
            content,
            style,
            dpi: self.dpi,
            variants: self
                .variants
                .iter()
                .map(|v| v.trim().to_string())
                .filter(|v| !v.is_empty())
                .collect(),
        })
    }
}

/// Refuses a PNG too large to draw, and notes that --dpi does nothing for
/// vector output (shared with the charts of `sweep` and `simulate`).
pub(crate) fn check_resolution(format: Format, style: &Style, dpi: u32) -> Result<(), CliError> {
    if format == Format::Png {
        let (px_w, px_h) =
            eyrie::render::pixel_size(style.width_mm, style.height_mm, f64::from(dpi));
        if px_w * px_h > eyrie::render::MAX_PIXELS {
            return Err(CliError::Usage(format!(
                "a {} × {} mm PNG at {dpi} dpi would be {px_w} × {px_h} pixels, more than \
                 eyrie draws ({} million); lower --dpi",
                style.width_mm,
                style.height_mm,
                eyrie::render::MAX_PIXELS / 1_000_000
            )));
        }
    } else if dpi != 600 {
        eprintln!(
            "note: --dpi applies to PNG only; {} is vector and has no resolution",
            format.extension().to_uppercase()
        );
    }
    Ok(())
}

/// The scene as the bytes of a file in `format` (shared with the charts).
pub(crate) fn encode(
    scene: &eyrie::layout::Scene,
    format: Format,
    dpi: u32,
) -> Result<Vec<u8>, CliError> {
    let bytes = match format {
        Format::Svg => Ok(eyrie::render::to_svg(scene).into_bytes()),
        Format::Png => eyrie::render::to_png(scene, f64::from(dpi)),
        Format::Pdf => eyrie::render::to_pdf(scene),
    };
    bytes.map_err(|e| CliError::Usage(format!("cannot draw the figure: {e}")))
}

/// The annotation kinds named on the command line ("all" for every one).
fn annotations(names: &[String]) -> Result<Vec<AnnotationKind>, CliError> {
    let mut kinds = Vec::new();
    for name in names.iter().map(|n| n.trim()).filter(|n| !n.is_empty()) {
        if name == "all" {
            kinds.extend(AnnotationKind::ALL);
        } else if let Some(kind) = AnnotationKind::from_name(name) {
            kinds.push(kind);
        } else {
            let known: Vec<&str> = AnnotationKind::ALL.iter().map(|k| k.name()).collect();
            return Err(CliError::Usage(format!(
                "unknown annotation '{name}' in --annotate: choose from {}, or all",
                known.join(", ")
            )));
        }
    }
    Ok(kinds)
}

/// The indices of the variants `names` asks for in `model` ("all" for every
/// one, in file order); an unknown name is a usage error naming the variants
/// there are.
fn variant_indices(names: &[String], model: &Model) -> Result<Vec<usize>, CliError> {
    let known: Vec<&str> = model.variants().iter().map(|v| v.name.as_str()).collect();
    let mut out = Vec::new();
    for name in names {
        let found: Vec<usize> = if name == "all" {
            (0..known.len()).collect()
        } else {
            match known.iter().position(|k| k == name) {
                Some(i) => vec![i],
                None => {
                    let have = if known.is_empty() {
                        "the profile has no [[variant]]".to_string()
                    } else {
                        format!("the profile's variants are {}", known.join(", "))
                    };
                    return Err(CliError::Usage(format!(
                        "unknown variant '{name}' in --variants: {have} (or write all)"
                    )));
                }
            }
        };
        for i in found {
            if !out.contains(&i) {
                out.push(i);
            }
        }
    }
    Ok(out)
}

impl Target {
    /// The figure of `model` as the bytes of the output file.
    pub fn draw(&self, model: &Model) -> Result<Vec<u8>, CliError> {
        let mut content = self.content.clone();
        content.variants = variant_indices(&self.variants, model)?;
        let spec = eyrie::figure::diagram_spec(model, &content);
        let (scene, crowding) = eyrie::layout::layout_report(&spec, &self.style);
        if let Some(w) = crowding.warning(&self.style) {
            eprintln!("warning: {}: {w}", self.output.display());
        }
        encode(&scene, self.format, self.dpi)
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
    if target.variants.iter().any(|v| v == "all") && parsed.model.variants().is_empty() {
        eprintln!(
            "note: {} has no [[variant]]; the profile is drawn alone",
            path.display()
        );
    }
    target.write(&conditions.apply(parsed.model))?;
    eprintln!("wrote {}", target.output.display());
    Ok(())
}

/// Renders one profile, or several (files and folders) into the folder `-o`
/// names: a bad profile is reported by name, the others are still drawn, and
/// the exit code is the worst seen.
pub fn run_all(
    inputs: &[PathBuf],
    skip_unchanged: bool,
    figure: &FigureOptions,
    conditions: &super::Conditions,
) -> Result<(), CliError> {
    let paths = files::expand(inputs)?;
    if let [path] = &paths[..]
        && !inputs[0].is_dir()
    {
        return run(path, figure, conditions);
    }
    let folder = figure.output.clone().unwrap_or_else(|| PathBuf::from("."));
    if folder.extension().is_some() && !folder.is_dir() {
        return Err(CliError::Usage(format!(
            "with several profiles, -o names a folder for the figures, not '{}' \
             (choose the format with --format)",
            folder.display()
        )));
    }
    std::fs::create_dir_all(&folder).map_err(|source| CliError::Io {
        action: "write",
        path: folder.clone(),
        source,
    })?;
    let format = figure.format.unwrap_or(Format::Svg);
    let (mut drawn, mut skipped, mut failed) = (0, 0, 0);
    let mut worst = super::error::Exit::Success;
    for path in &paths {
        let mut one = figure.clone();
        one.output = Some(folder.join(default_output(path, format)));
        let output = one.output.clone().expect("just set");
        if skip_unchanged && newer(&output, path) {
            skipped += 1;
            continue;
        }
        match run(path, &one, conditions) {
            Ok(()) => drawn += 1,
            Err(e) => {
                e.report();
                worst = worst.max(e.exit());
                failed += 1;
            }
        }
    }
    eprintln!(
        "{drawn} figure(s) drawn, {skipped} unchanged, {failed} failed ({} profile(s))",
        paths.len()
    );
    match worst {
        super::error::Exit::Success => Ok(()),
        code => Err(CliError::Finished(code)),
    }
}

/// Whether `output` exists and was written after `input` last changed.
fn newer(output: &Path, input: &Path) -> bool {
    let modified = |p: &Path| std::fs::metadata(p).and_then(|m| m.modified()).ok();
    matches!((modified(output), modified(input)), (Some(o), Some(i)) if o >= i)
}

fn default_output(input: &Path, format: Format) -> PathBuf {
    let stem = input
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| "figure".into());
    PathBuf::from(format!("{stem}.{}", format.extension()))
}

/// A length in mm for a page side: a number from 20 to 1000.
pub(crate) fn parse_mm(text: &str) -> Result<f64, String> {
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
    fn annotations_by_name_or_all() {
        let names = |v: &[&str]| v.iter().map(|s| s.to_string()).collect::<Vec<_>>();
        assert_eq!(
            annotations(&names(&["barriers", " span"])).unwrap(),
            vec![AnnotationKind::Barriers, AnnotationKind::Span]
        );
        assert_eq!(annotations(&names(&["all"])).unwrap().len(), 4);
        let e = annotations(&names(&["barrier"])).unwrap_err().to_string();
        assert!(e.contains("rate-determining"), "{e}");
    }

    #[test]
    fn lengths_in_mm() {
        assert_eq!(parse_mm("85").unwrap(), 85.0);
        assert_eq!(parse_mm("170 mm").unwrap(), 170.0);
        assert!(parse_mm("5").is_err());
        assert!(parse_mm("wide").is_err());
    }
}
