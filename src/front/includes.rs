//! Loading included sheets from disk, with the sandbox rule: a path is resolved from the
//! including sheet's folder and may not leave the main sheet's folder tree (no absolute paths,
//! no `..` above it, no symbolic link out of it) unless the user passes `--allow-outside`, so
//! running a colleague's sheet cannot read arbitrary files.

use super::limits::{FileKind, ReadLimits};
use crate::eval::{IncludeLoader, LoadedSheet};
use std::collections::HashMap;
use std::path::{Path, PathBuf};

pub struct FileIncludeLoader {
    /// The main sheet's folder, canonical: the sandbox.
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
        let root = std::fs::canonicalize(folder).unwrap_or_else(|_| folder.to_path_buf());
        let mut folders = HashMap::new();
        folders.insert(label.to_string(), folder.to_path_buf());
        let main_key = path
            .and_then(|path| std::fs::canonicalize(path).ok())
            .map(|path| path.to_string_lossy().into_owned());
        FileIncludeLoader {
            root,
            main_key,
            allow_outside,
            folders,
            limits: ReadLimits::default(),
            files_read: Vec::new(),
        }
    }

    /// The same loader with other file size limits than the defaults.
    pub fn with_limits(mut self, limits: ReadLimits) -> FileIncludeLoader {
        self.limits = limits;
        self
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
                "`{path}` is outside the sheet's folder; pass --allow-outside to include it anyway"
            ));
        }
        let text = self.limits.read_file(&canonical, path, kind)?;
        if !self.files_read.contains(&canonical) {
            self.files_read.push(canonical.clone());
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
