//! Files a command writes (reports, charts). An output never replaces an input of the run (the
//! sheet, an included sheet, a data file; by any spelling, symbolic or hard link); it is written
//! whole through a temporary file beside it and renamed into place, keeps the permissions of the
//! file it replaces, and is not written through a symbolic link (that would silently replace
//! the link, or the file it names). A temporary file is removed on Ctrl-C or a termination
//! signal, so an interrupted run leaves nothing behind.

use std::fs::{self, File, OpenOptions};
use std::io;
use std::path::{Path, PathBuf};
use std::sync::{Mutex, Once};

/// Why `output` may not be written: it is one of `inputs`, or a symbolic link.
pub fn refuse_output(output: &Path, inputs: &[PathBuf]) -> Result<(), String> {
    if let Some(input) = inputs.iter().find(|input| same_file(input, output)) {
        return Err(format!(
            "refusing to write `{}`: it is `{}`, an input of this run; choose another file",
            output.display(),
            input.display()
        ));
    }
    if fs::symlink_metadata(output).is_ok_and(|metadata| metadata.file_type().is_symlink()) {
        return Err(format!(
            "refusing to write `{}`: it is a symbolic link; name the file it points to, or remove the link",
            output.display()
        ));
    }
    Ok(())
}

/// Whether `output` names the file `input` is (through `..`, symbolic links or, on Unix, a
/// hard link). An output that does not exist yet is compared through its folder.
pub fn same_file(input: &Path, output: &Path) -> bool {
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
/// `path`, so a reader sees the old file or the whole new one, never a part. On any failure,
/// or a signal, the temporary file is removed and `path` is untouched. A replaced file's
/// permissions carry over to the new one.
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
    remove_temporaries_on_signal();
    let (temporary, mut file) = create_temporary(folder, &name)?;
    let written = fill(&mut file)
        .and_then(|_| match fs::metadata(path) {
            Ok(existing) => file.set_permissions(existing.permissions()),
            Err(_) => Ok(()),
        })
        .and_then(|_| file.sync_all())
        .and_then(|_| {
            drop(file);
            fs::rename(&temporary, path)
        });
    if written.is_err() {
        let _ = fs::remove_file(&temporary);
    }
    forget_temporary(&temporary);
    written
}

/// Temporary files being written, removed by the signal handler.
static TEMPORARIES: Mutex<Vec<PathBuf>> = Mutex::new(Vec::new());

/// The exit code after an interrupting signal (128 + SIGINT, as shells report it).
const INTERRUPTED: i32 = 130;

fn remove_temporaries_on_signal() {
    static INSTALL: Once = Once::new();
    INSTALL.call_once(|| {
        // If a handler cannot be installed, writing still works; only the cleanup is lost.
        let _ = ctrlc::set_handler(|| {
            let temporaries = TEMPORARIES
                .lock()
                .unwrap_or_else(|poisoned| poisoned.into_inner());
            for temporary in temporaries.iter() {
                let _ = fs::remove_file(temporary);
            }
            std::process::exit(INTERRUPTED);
        });
    });
}

fn forget_temporary(temporary: &Path) {
    let mut temporaries = TEMPORARIES
        .lock()
        .unwrap_or_else(|poisoned| poisoned.into_inner());
    temporaries.retain(|known| known != temporary);
}

fn create_temporary(folder: &Path, name: &str) -> io::Result<(PathBuf, File)> {
    let process = std::process::id();
    let mut last_error = None;
    for attempt in 0..100u32 {
        let candidate = folder.join(format!(".{name}.{process}.{attempt}.tmp"));
        // Registered before it exists, so a signal between the two cannot leave it behind.
        TEMPORARIES
            .lock()
            .unwrap_or_else(|poisoned| poisoned.into_inner())
            .push(candidate.clone());
        match OpenOptions::new()
            .write(true)
            .create_new(true)
            .open(&candidate)
        {
            Ok(file) => return Ok((candidate, file)),
            Err(error) => {
                forget_temporary(&candidate);
                if error.kind() != io::ErrorKind::AlreadyExists {
                    return Err(error);
                }
                last_error = Some(error);
            }
        }
    }
    Err(last_error
        .unwrap_or_else(|| io::Error::new(io::ErrorKind::AlreadyExists, "no temporary name")))
}

#[cfg(test)]
mod tests {
    #![allow(clippy::unwrap_used)]
    use super::{refuse_output, same_file, write_atomically};
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

    #[cfg(unix)]
    #[test]
    fn a_replaced_file_keeps_its_permissions() {
        use std::os::unix::fs::PermissionsExt;
        let folder = tempfile::tempdir().unwrap();
        let target = folder.path().join("report.md");
        std::fs::write(&target, "old").unwrap();
        std::fs::set_permissions(&target, std::fs::Permissions::from_mode(0o640)).unwrap();
        write_atomically(&target, |file| file.write_all(b"new")).unwrap();
        let mode = std::fs::metadata(&target).unwrap().permissions().mode() & 0o777;
        assert_eq!(mode, 0o640);
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

    #[cfg(unix)]
    #[test]
    fn a_symbolic_link_is_not_written_through() {
        let folder = tempfile::tempdir().unwrap();
        let real = folder.path().join("real.svg");
        std::fs::write(&real, "<svg/>").unwrap();
        let link = folder.path().join("link.svg");
        std::os::unix::fs::symlink(&real, &link).unwrap();
        let refusal = refuse_output(&link, &[]).unwrap_err();
        assert!(refusal.contains("symbolic link"), "{refusal}");
        assert!(refuse_output(&folder.path().join("new.svg"), std::slice::from_ref(&real)).is_ok());
    }
}
