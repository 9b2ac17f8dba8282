//! `fluxsheet report FILE -o REPORT.md|REPORT.html`: evaluates a sheet and writes its report,
//! atomically (a temporary file in the target's folder, then a rename), never over the sheet
//! itself.

use super::{exit, exit_code_for, read_sheet};
use crate::render::report::{write_html, write_markdown, ReportContext};
use crate::render::RenderOptions;
use clap::Args;
use std::fs::{self, File, OpenOptions};
use std::io::{self, Write};
use std::path::{Path, PathBuf};

#[derive(Args, Debug)]
#[command(
    after_help = "The format follows the output's extension: .md (Markdown) or .html (one \
self-contained page). The report is written even when a check fails or the sheet has errors (it \
says so); the exit code is the sheet's, as with `run`.\n\nExamples:\n  fluxsheet report \
worksheets/core_permeability.fxs -o core.html\n  fluxsheet report site.fxs -o site-report.md \
--digits 6"
)]
pub struct ReportArgs {
    /// The sheet (`-` reads standard input)
    pub file: String,
    /// The report to write: `.md` or `.html`
    #[arg(short = 'o', long = "output", value_name = "REPORT.md|REPORT.html")]
    pub output: PathBuf,
    /// Let `include` and `column … from` lines read files outside the sheet's folder tree
    #[arg(long)]
    pub allow_outside: bool,
    #[command(flatten)]
    pub limits: super::LimitArgs,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum ReportFormat {
    Markdown,
    Html,
}

fn format_of(path: &Path) -> Option<ReportFormat> {
    let extension = path.extension()?.to_str()?.to_ascii_lowercase();
    match extension.as_str() {
        "md" | "markdown" => Some(ReportFormat::Markdown),
        "html" | "htm" => Some(ReportFormat::Html),
        _ => None,
    }
}

/// Runs `report`; returns the exit code.
pub fn run(out: &mut dyn Write, arguments: &ReportArgs, options: RenderOptions) -> io::Result<u8> {
    let source = match read_sheet(&arguments.file, &arguments.limits.read_limits()) {
        Ok(source) => source,
        Err(message) => {
            eprintln!("error: {message}");
            return Ok(exit::SHEET_ERROR);
        }
    };
    let output = &arguments.output;
    if arguments.file != "-" && same_file(Path::new(&arguments.file), output) {
        eprintln!(
            "error: refusing to write the report over its own sheet `{}`; choose another file \
for -o",
            arguments.file
        );
        return Ok(exit::USAGE);
    }
    let Some(format) = format_of(output) else {
        eprintln!(
            "error: cannot tell the report format from `{}`: name it *.md or *.html",
            output.display()
        );
        return Ok(exit::USAGE);
    };
    let path = (arguments.file != "-").then(|| Path::new(arguments.file.as_str()));
    let evaluation = super::evaluate_file(
        &source,
        path,
        arguments.allow_outside,
        false,
        &arguments.limits.settings(),
        &arguments.limits.read_limits(),
    );
    let context = ReportContext {
        label: &source.label,
        source: &source.text,
        evaluation: &evaluation,
        version: env!("CARGO_PKG_VERSION"),
        digits: options.digits,
    };
    let mut contents = Vec::new();
    match format {
        ReportFormat::Markdown => write_markdown(&mut contents, &context)?,
        ReportFormat::Html => write_html(&mut contents, &context)?,
    }
    if let Err(error) = write_atomically(output, |file| file.write_all(&contents)) {
        eprintln!("error: cannot write `{}`: {error}", output.display());
        return Ok(exit::SHEET_ERROR);
    }
    writeln!(out, "wrote {}", output.display())?;
    Ok(exit_code_for(&evaluation))
}

/// Whether `output` names the file `input` is (through `..`, symbolic links or, on Unix, a
/// hard link). An output that does not exist yet is compared through its folder.
fn same_file(input: &Path, output: &Path) -> bool {
    let Ok(input_canonical) = input.canonicalize() else {
        return false;
    };
    let output_canonical = output.canonicalize().ok().or_else(|| {
        let folder = match output.parent() {
            Some(parent) if !parent.as_os_str().is_empty() => parent,
            _ => Path::new("."),
        };
        Some(folder.canonicalize().ok()?.join(output.file_name()?))
    });
    if output_canonical.as_ref() == Some(&input_canonical) {
        return true;
    }
    #[cfg(unix)]
    {
        use std::os::unix::fs::MetadataExt;
        if let (Ok(a), Ok(b)) = (fs::metadata(input), fs::metadata(output)) {
            return a.dev() == b.dev() && a.ino() == b.ino();
        }
    }
    false
}

/// Writes `path` by filling a new temporary file in the same folder and renaming it over
/// `path`, so a reader sees the old file or the whole new one, never a part. On any failure
/// the temporary file is removed and `path` is untouched.
pub fn write_atomically(
    path: &Path,
    fill: impl FnOnce(&mut File) -> io::Result<()>,
) -> io::Result<()> {
    let folder = match path.parent() {
        Some(parent) if !parent.as_os_str().is_empty() => parent,
        _ => Path::new("."),
    };
    let name = path
        .file_name()
        .ok_or_else(|| io::Error::new(io::ErrorKind::InvalidInput, "not a file name"))?
        .to_string_lossy()
        .into_owned();
    let (temporary, mut file) = create_temporary(folder, &name)?;
    let written = fill(&mut file).and_then(|_| file.sync_all()).and_then(|_| {
        drop(file);
        fs::rename(&temporary, path)
    });
    if written.is_err() {
        let _ = fs::remove_file(&temporary);
    }
    written
}

fn create_temporary(folder: &Path, name: &str) -> io::Result<(PathBuf, File)> {
    let process = std::process::id();
    let mut last_error = None;
    for attempt in 0..100u32 {
        let candidate = folder.join(format!(".{name}.{process}.{attempt}.tmp"));
        match OpenOptions::new()
            .write(true)
            .create_new(true)
            .open(&candidate)
        {
            Ok(file) => return Ok((candidate, file)),
            Err(error) if error.kind() == io::ErrorKind::AlreadyExists => {
                last_error = Some(error);
            }
            Err(error) => return Err(error),
        }
    }
    Err(last_error
        .unwrap_or_else(|| io::Error::new(io::ErrorKind::AlreadyExists, "no temporary name")))
}

#[cfg(test)]
mod tests {
    #![allow(clippy::unwrap_used)]
    use super::{same_file, write_atomically};
    use std::io::{self, Write};

    #[test]
    fn a_failed_write_leaves_the_old_file_and_no_temporary() {
        let folder = tempfile::tempdir().unwrap();
        let target = folder.path().join("report.md");
        std::fs::write(&target, "old report").unwrap();
        let result = write_atomically(&target, |file| {
            file.write_all(b"half of a new rep")?;
            Err(io::Error::other("disk full"))
        });
        assert!(result.is_err());
        assert_eq!(std::fs::read_to_string(&target).unwrap(), "old report");
        let names: Vec<_> = std::fs::read_dir(folder.path()).unwrap().collect();
        assert_eq!(names.len(), 1, "temporary file left behind");
    }

    #[test]
    fn a_write_replaces_the_whole_file() {
        let folder = tempfile::tempdir().unwrap();
        let target = folder.path().join("report.html");
        std::fs::write(&target, "old report, longer than the new one").unwrap();
        write_atomically(&target, |file| file.write_all(b"new")).unwrap();
        assert_eq!(std::fs::read_to_string(&target).unwrap(), "new");
        assert_eq!(std::fs::read_dir(folder.path()).unwrap().count(), 1);
    }

    #[test]
    fn same_file_sees_through_dot_dot() {
        let folder = tempfile::tempdir().unwrap();
        let sheet = folder.path().join("a.md");
        std::fs::write(&sheet, "x = 1\n").unwrap();
        std::fs::create_dir(folder.path().join("sub")).unwrap();
        let roundabout = folder.path().join("sub").join("..").join("a.md");
        assert!(same_file(&sheet, &roundabout));
        assert!(!same_file(&sheet, &folder.path().join("b.md")));
    }
}
