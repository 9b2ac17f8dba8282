//! Loading included sheets from disk, with the sandbox rule: a path is resolved from the
//! including sheet's folder and may not leave the main sheet's folder tree (no absolute paths,
//! no `..` above it, no symbolic link out of it) unless the user passes `--allow-outside`, so
//! running a colleague's sheet cannot read arbitrary files. A folder above the sheet holding a
//! `fluxsheet.project` file widens the tree to that project folder.

use super::limits::{FileKind, ReadLimits};
use crate::eval::{IncludeLoader, LoadedSheet};
use crate::render::report::{sha256_hex, InputFile};
use std::collections::HashMap;
use std::path::{Path, PathBuf};

pub struct FileIncludeLoader {
    /// The sandbox, canonical: the nearest folder above the sheet holding a `PROJECT_MARKER`
    /// file, or else the main sheet's folder.
    root: PathBuf,
    /// The main sheet's canonical path, for include cycles back to it.
    main_key: Option<String>,
    allow_outside: bool,
    /// Folder of each loaded sheet, by label, to resolve its own includes.
    folders: HashMap<String, PathBuf>,
    limits: ReadLimits,
    /// Every file read (included sheets and data files), canonical: the inputs of the run,
    /// which no output may overwrite.
    files_read: Vec<PathBuf>,
    /// The same files with their SHA-256, hashed from the very bytes the run used.
    inputs: Vec<InputFile>,
    /// The main sheet's folder, canonical: input paths are given relative to it.
    sheet_folder: PathBuf,
}

impl FileIncludeLoader {
    /// A loader for the sheet `label` found at `path` (`None` for standard input: the current
    /// folder is the root then).
    pub fn new(label: &str, path: Option<&Path>, allow_outside: bool) -> FileIncludeLoader {
        let folder = path
            .and_then(|path| path.parent())
            .map(|parent| {
                if parent.as_os_str().is_empty() {
                    Path::new(".")
                } else {
                    parent
                }
            })
            .unwrap_or(Path::new("."));
        let sheet_folder = std::fs::canonicalize(folder).unwrap_or_else(|_| folder.to_path_buf());
        let root = project_root(&sheet_folder).unwrap_or_else(|| sheet_folder.clone());
        let mut folders = HashMap::new();
        folders.insert(label.to_string(), folder.to_path_buf());
        let main_key = path
            .and_then(|path| std::fs::canonicalize(path).ok())
            .map(|path| path.to_string_lossy().into_owned());
        FileIncludeLoader {
            sheet_folder,
            root,
            main_key,
            allow_outside,
            folders,
            limits: ReadLimits::default(),
            files_read: Vec::new(),
            inputs: Vec::new(),
        }
    }

    /// The same loader with other file size limits than the defaults.
    pub fn with_limits(mut self, limits: ReadLimits) -> FileIncludeLoader {
        self.limits = limits;
        self
    }

    /// The included sheets and data files read so far, with their hashes, in reading order.
    pub fn inputs(&self) -> &[InputFile] {
        &self.inputs
    }

    /// The files read so far (included sheets and data files), canonical.
    pub fn files_read(&self) -> &[PathBuf] {
        &self.files_read
    }
}

impl IncludeLoader for FileIncludeLoader {
    fn main_key(&self, label: &str) -> String {
        self.main_key.clone().unwrap_or_else(|| label.to_string())
    }

    fn load(&mut self, path: &str, from: &str) -> Result<LoadedSheet, String> {
        self.load_file(path, from, FileKind::Sheet)
    }

    fn load_data(&mut self, path: &str, from: &str) -> Result<LoadedSheet, String> {
        self.load_file(path, from, FileKind::Data)
    }
}

impl FileIncludeLoader {
    fn load_file(&mut self, path: &str, from: &str, kind: FileKind) -> Result<LoadedSheet, String> {
        let requested = Path::new(path);
        if requested.is_absolute() && !self.allow_outside {
            return Err(format!(
                "`{path}` is an absolute path; includes are relative to the sheet (pass --allow-outside to allow it)"
            ));
        }
        let folder = self
            .folders
            .get(from)
            .cloned()
            .unwrap_or_else(|| PathBuf::from("."));
        let joined = folder.join(requested);
        let canonical = std::fs::canonicalize(&joined)
            .map_err(|error| format!("cannot read `{path}`: {error}"))?;
        if !self.allow_outside && !canonical.starts_with(&self.root) {
            return Err(format!(
                "`{path}` is outside the sheet's folder; pass --allow-outside to include it anyway, or mark a project folder around both with a `{PROJECT_MARKER}` file"
            ));
        }
        let text = self.limits.read_file(&canonical, path, kind)?;
        if !self.files_read.contains(&canonical) {
            self.files_read.push(canonical.clone());
            self.inputs.push(InputFile {
                path: relative_path(&self.sheet_folder, &canonical),
                sha256: sha256_hex(text.as_bytes()),
                bytes: text.len(),
            });
        }
        let label = joined.to_string_lossy().replace("/./", "/");
        let label = label.strip_prefix("./").unwrap_or(&label).to_string();
        let parent = joined
            .parent()
            .map(Path::to_path_buf)
            .unwrap_or_else(|| PathBuf::from("."));
        self.folders.insert(label.clone(), parent);
        Ok(LoadedSheet {
            label,
            key: canonical.to_string_lossy().into_owned(),
            text,
        })
    }
}

/// The file that marks a project folder: includes and data files of any sheet below it may
/// read anything inside it (`include "../shared/site.fxs"`), and still nothing outside.
pub const PROJECT_MARKER: &str = "fluxsheet.project";

/// The nearest folder from `folder` (canonical) upward that holds a `PROJECT_MARKER` file.
fn project_root(folder: &Path) -> Option<PathBuf> {
    folder
        .ancestors()
        .find(|ancestor| ancestor.join(PROJECT_MARKER).is_file())
        .map(Path::to_path_buf)
}

/// `target` relative to the folder `from` (both canonical), with `..` where it climbs out:
/// how the sheet's own folder reaches the file, so two copies of a project compare alike.
pub fn relative_path(from: &Path, target: &Path) -> String {
    let from: Vec<_> = from.components().collect();
    let to: Vec<_> = target.components().collect();
    let common = from
        .iter()
        .zip(&to)
        .take_while(|(left, right)| left == right)
        .count();
    let mut parts: Vec<String> = vec!["..".to_string(); from.len() - common];
    parts.extend(
        to[common..]
            .iter()
            .map(|part| part.as_os_str().to_string_lossy().into_owned()),
    );
    parts.join("/")
}

#[cfg(test)]
mod tests {
    use super::relative_path;
    use std::path::Path;

    #[test]
    fn relative_paths_climb_with_dot_dot() {
        let check = |from: &str, to: &str, expected: &str| {
            assert_eq!(relative_path(Path::new(from), Path::new(to)), expected);
        };
        check("/p/sheets", "/p/sheets/shared/a.fxs", "shared/a.fxs");
        check("/p/sheets", "/p/shared/a.fxs", "../shared/a.fxs");
        check("/p/sheets/deep", "/q/a.csv", "../../../q/a.csv");
    }
}
