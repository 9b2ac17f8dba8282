//! How large a file the front doors read. Reading stops one byte past the limit, so a huge
//! file, a device such as `/dev/zero` or an endless pipe is an error after a bounded read,
//! never a process that grows until the machine kills it. Sheets and data files have separate
//! limits because a sheet costs about a hundred times its size in memory once evaluated (its
//! tree, results and texts), a data file a few times.

use std::io::Read;
use std::path::Path;

/// The default largest sheet: 8 MiB, some 400 000 lines, far beyond a written sheet.
pub const DEFAULT_MAX_SHEET_BYTES: u64 = 8 * 1024 * 1024;

/// The default largest data file: 256 MiB, ten million rows of a few columns.
pub const DEFAULT_MAX_DATA_BYTES: u64 = 256 * 1024 * 1024;

/// The largest files a command reads.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ReadLimits {
    /// A sheet, an included sheet or standard input.
    pub sheet_bytes: u64,
    /// A data file of a `column … from` line.
    pub data_bytes: u64,
}

impl Default for ReadLimits {
    fn default() -> ReadLimits {
        ReadLimits {
            sheet_bytes: DEFAULT_MAX_SHEET_BYTES,
            data_bytes: DEFAULT_MAX_DATA_BYTES,
        }
    }
}

/// What is being read, for the limit that applies and the option that raises it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FileKind {
    Sheet,
    Data,
}

impl ReadLimits {
    fn bytes_for(&self, kind: FileKind) -> u64 {
        match kind {
            FileKind::Sheet => self.sheet_bytes,
            FileKind::Data => self.data_bytes,
        }
    }

    /// Reads all of `reader` as UTF-8 text, or says why not: `label` names it in messages.
    pub fn read_text(
        &self,
        reader: impl Read,
        label: &str,
        kind: FileKind,
    ) -> Result<String, String> {
        let limit = self.bytes_for(kind);
        let mut bytes = Vec::new();
        reader
            .take(limit.saturating_add(1))
            .read_to_end(&mut bytes)
            .map_err(|error| format!("cannot read `{label}`: {error}"))?;
        if bytes.len() as u64 > limit {
            let (what, option) = match kind {
                FileKind::Sheet => ("a sheet", "--max-sheet-bytes"),
                FileKind::Data => ("a data file", "--max-data-bytes"),
            };
            return Err(format!(
                "`{label}` is larger than {limit} bytes, the limit for {what} (raise it with `{option}`)"
            ));
        }
        String::from_utf8(bytes).map_err(|_| format!("cannot read `{label}`: it is not UTF-8 text"))
    }

    /// Reads the file at `path` as UTF-8 text, `label` naming it in messages.
    pub fn read_file(&self, path: &Path, label: &str, kind: FileKind) -> Result<String, String> {
        let file =
            std::fs::File::open(path).map_err(|error| format!("cannot read `{label}`: {error}"))?;
        self.read_text(file, label, kind)
    }
}

#[cfg(test)]
mod tests {
    use super::{FileKind, ReadLimits};

    #[test]
    fn reading_stops_just_past_the_limit() {
        let limits = ReadLimits {
            sheet_bytes: 4,
            data_bytes: 8,
        };
        // An endless reader: only the limit and one byte are ever read from it.
        let endless = std::io::repeat(b'x');
        let refused = limits.read_text(endless, "big.fxs", FileKind::Sheet);
        assert_eq!(
            refused,
            Err("`big.fxs` is larger than 4 bytes, the limit for a sheet (raise it with `--max-sheet-bytes`)".to_string())
        );
        assert_eq!(
            limits.read_text(&b"12345678"[..], "d.csv", FileKind::Data),
            Ok("12345678".to_string())
        );
        let refused_data = limits.read_text(&b"123456789"[..], "d.csv", FileKind::Data);
        assert!(refused_data.is_err_and(|message| message.contains("--max-data-bytes")));
        let binary = limits.read_text(&[0xff_u8, 0xfe][..], "b.fxs", FileKind::Sheet);
        assert_eq!(
            binary,
            Err("cannot read `b.fxs`: it is not UTF-8 text".to_string())
        );
    }
}
