//! File URIs and paths. Only `file:` documents have a folder, and so includes and data files;
//! any other document (an unsaved buffer) is evaluated with includes refused.

use lsp_types::Uri;
use std::path::{Path, PathBuf};
use std::str::FromStr;

/// The path of a `file:` URI, percent-decoded; `None` for other schemes.
pub fn path_of(uri: &Uri) -> Option<PathBuf> {
    let text = uri.as_str();
    let rest = text.strip_prefix("file://")?;
    // `file:///a/b` or `file://localhost/a/b`.
    let path = rest.strip_prefix("localhost").unwrap_or(rest);
    if !path.starts_with('/') {
        return None;
    }
    let bytes = percent_decode(path)?;
    let decoded = String::from_utf8(bytes).ok()?;
    Some(PathBuf::from(decoded))
}

/// The `file:` URI of an absolute path.
pub fn uri_of(path: &Path) -> Option<Uri> {
    let text = path.to_str()?;
    if !text.starts_with('/') {
        return None;
    }
    let mut uri = String::from("file://");
    for byte in text.bytes() {
        if byte.is_ascii_alphanumeric() || b"/-._~".contains(&byte) {
            uri.push(char::from(byte));
        } else {
            uri.push_str(&format!("%{byte:02X}"));
        }
    }
    Uri::from_str(&uri).ok()
}

fn percent_decode(text: &str) -> Option<Vec<u8>> {
    let bytes = text.as_bytes();
    let mut decoded = Vec::with_capacity(bytes.len());
    let mut index = 0;
    while index < bytes.len() {
        if bytes[index] == b'%' {
            let hex = text.get(index + 1..index + 3)?;
            decoded.push(u8::from_str_radix(hex, 16).ok()?);
            index += 3;
        } else {
            decoded.push(bytes[index]);
            index += 1;
        }
    }
    Some(decoded)
}

#[cfg(test)]
mod tests {
    use super::{path_of, uri_of};
    use std::path::Path;

    #[test]
    fn paths_round_trip_through_file_uris_with_spaces_and_letters_of_any_script() {
        let path = Path::new("/sites/Harwick Flats/ρ_w.fxs");
        let uri = uri_of(path).expect("an absolute path has a URI");
        assert_eq!(uri.as_str(), "file:///sites/Harwick%20Flats/%CF%81_w.fxs");
        assert_eq!(path_of(&uri).as_deref(), Some(path));
    }

    #[test]
    fn other_schemes_and_broken_escapes_have_no_path() {
        let untitled = "untitled:Untitled-1".parse().expect("a valid URI");
        assert_eq!(path_of(&untitled), None);
        let broken = "file:///a%zz".parse();
        if let Ok(broken) = broken {
            assert_eq!(path_of(&broken), None);
        }
    }
}
