//! Reading a release file as the index will name it: its SHA-256 (checked
//! against `SHA256SUMS` for the bundled sources), gzip undone, and the text
//! as UTF-8 or, failing that, ISO-8859-1.

use crate::error::BuildError;
use rollcall::model::Source;
use std::io::Read;
use std::path::Path;

/// A file read: its name, its text and the source entry of the index.
pub struct Loaded {
    pub name: String,
    pub text: String,
    pub source: Source,
}

/// Reads `path`, whose part in the release is `role`; with `sums` (the
/// text of `SHA256SUMS`), refuses a file not listed or not matching.
pub fn load(path: &Path, role: &str, sums: Option<&str>) -> Result<Loaded, BuildError> {
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().to_string())
        .unwrap_or_default();
    let raw = std::fs::read(path).map_err(|e| {
        BuildError::file(
            &path.display().to_string(),
            format!("cannot be read ({e}); check the path"),
        )
    })?;
    let sha = rollcall::sha256::hex(&rollcall::sha256::digest(&raw));
    if let Some(sums) = sums {
        check_sum(&name, &sha, sums)?;
    }
    let text = if name.ends_with(".gz") {
        let mut bytes = Vec::new();
        flate2::read::MultiGzDecoder::new(&raw[..])
            .read_to_end(&mut bytes)
            .map_err(|e| {
                BuildError::file(&name, format!("is not valid gzip-compressed data ({e})"))
            })?;
        latin1_if_not_utf8(&name, bytes)
    } else {
        latin1_if_not_utf8(&name, raw)
    };
    Ok(Loaded {
        source: Source {
            file: name.clone(),
            sha256: sha,
            role: role.to_string(),
        },
        name,
        text,
    })
}

/// Whether `SHA256SUMS` (lines `HASH  NAME`) lists `name` with `sha`.
fn check_sum(name: &str, sha: &str, sums: &str) -> Result<(), BuildError> {
    let want = sums.lines().find_map(|l| {
        l.split_once("  ")
            .filter(|(_, f)| *f == name)
            .map(|(h, _)| h)
    });
    match want {
        Some(h) if h == sha => Ok(()),
        Some(h) => Err(BuildError::file(
            name,
            format!("SHA-256 is {sha} but SHA256SUMS says {h}; restore the file from ../shared/vocab or from git"),
        )),
        None => Err(BuildError::file(name, "is not listed in SHA256SUMS")),
    }
}

/// Text as UTF-8, or, when it is not, as ISO-8859-1 (the encoding of the
/// CMS ICD-9-CM files), saying so.
fn latin1_if_not_utf8(name: &str, bytes: Vec<u8>) -> String {
    match String::from_utf8(bytes) {
        Ok(s) => s,
        Err(e) => {
            eprintln!("note: {name} is not UTF-8; read as ISO-8859-1");
            e.into_bytes().into_iter().map(char::from).collect()
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // The SHA-256 of "abc" (FIPS 180-2, appendix B.1).
    const ABC: &str = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad";

    #[test]
    fn a_listed_file_passes_and_a_changed_or_unlisted_one_is_refused() {
        let sums = format!("{ABC}  abc.txt\n");
        assert!(check_sum("abc.txt", ABC, &sums).is_ok());
        let changed = check_sum("abc.txt", &"0".repeat(64), &sums).unwrap_err();
        assert!(changed.message.contains("SHA256SUMS says"), "{changed}");
        let unlisted = check_sum("other.txt", ABC, &sums).unwrap_err();
        assert!(unlisted.message.contains("not listed"), "{unlisted}");
        assert_eq!(
            rollcall::sha256::hex(&rollcall::sha256::digest(b"abc")),
            ABC
        );
    }

    /// ISO-8859-1 maps each byte to the code point of its value (ISO/IEC 8859-1).
    #[test]
    fn text_that_is_not_utf8_is_read_as_latin1() {
        assert_eq!(latin1_if_not_utf8("f", b"caf\xe9".to_vec()), "café");
        assert_eq!(latin1_if_not_utf8("f", "café".as_bytes().to_vec()), "café");
    }
}
