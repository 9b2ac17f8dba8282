//! The committed fuzz corpus (`fuzz/seeds/TARGET`) replayed through the same entry points the
//! fuzz targets call, on the stable toolchain: every input that once found new behaviour, or
//! once crashed, stays a regression test. Fuzzing itself is `fuzz/run.sh` (DEVELOPERS.md).

#[path = "../fuzz/harness.rs"]
mod harness;

use std::path::PathBuf;

/// Every input of one target's corpus, sorted so that a failure names the same file each run.
fn corpus(target: &str) -> Vec<(PathBuf, Vec<u8>)> {
    let folder = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("fuzz/seeds")
        .join(target);
    let mut files: Vec<PathBuf> = std::fs::read_dir(&folder)
        .unwrap_or_else(|error| panic!("{}: {error}", folder.display()))
        .map(|entry| entry.unwrap().path())
        .collect();
    files.sort();
    assert!(!files.is_empty(), "no corpus in {}", folder.display());
    files
        .into_iter()
        .map(|path| {
            let bytes = std::fs::read(&path).unwrap();
            (path, bytes)
        })
        .collect()
}

/// Runs every input of `target` through `entry`, naming the input that panicked.
fn replay(target: &str, entry: fn(&[u8])) {
    for (path, bytes) in corpus(target) {
        let outcome = std::panic::catch_unwind(|| entry(&bytes));
        assert!(outcome.is_ok(), "{} panicked", path.display());
    }
}

#[test]
fn sheet_corpus_evaluates_and_renders_in_every_format() {
    replay("sheet", harness::sheet_in_every_format);
}

#[test]
fn parser_corpus_parses_or_diagnoses() {
    replay("parsers", harness::parsers);
}

#[test]
fn session_corpus_enters_every_line() {
    replay("session", harness::session_lines);
}

/// The fuzzing dictionary offers every built-in by name, so that runs reach every relation.
#[test]
fn the_dictionary_names_every_builtin() {
    let dictionary =
        std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/fuzz/fluxsheet.dict"))
            .unwrap();
    let missing: Vec<&str> = fluxsheet::library::Builtins::standard()
        .functions_sorted()
        .into_iter()
        .map(|(name, _)| name)
        .filter(|name| !dictionary.contains(&format!("\"{name}(\"")))
        .collect();
    assert!(
        missing.is_empty(),
        "not in fuzz/fluxsheet.dict: {missing:?}"
    );
}
