//! The manifest beside the page that describes an index or a notes file
//! (what it says about itself, its size and SHA-256), as `index-manifest`
//! writes it and the worker checks a fetched file against it.

use rollcall::Index;
use serde::{Deserialize, Serialize};

/// What an index says about itself, plus the size and SHA-256 of its bytes.
/// The same shape is written to `index-manifest.json` at build time.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq, Eq)]
pub struct IndexInfo {
    pub vocabulary: String,
    pub title: String,
    pub release: String,
    pub coverage_from: String,
    pub coverage_to: String,
    pub sources: Vec<SourceInfo>,
    /// Credit the release's licence asks to show (HPO); empty when none.
    #[serde(default)]
    pub notice: String,
    pub byte_length: u64,
    /// SHA-256 of the index content (everything after the 56-byte header),
    /// as sealed in the header and verified on open.
    pub sha256: String,
}

/// One source file an index was built from.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq, Eq)]
pub struct SourceInfo {
    pub file: String,
    pub sha256: String,
    pub role: String,
}

/// Lower-case hex SHA-256 of `bytes`.
pub fn sha256_hex_of(bytes: &[u8]) -> String {
    rollcall::sha256::hex(&rollcall::sha256::digest(bytes))
}

/// Describe an opened index whose file has the given size and SHA-256.
pub fn describe_index<D: AsRef<[u8]>>(
    index: &Index<D>,
    byte_length: u64,
    sha256: String,
) -> IndexInfo {
    let meta = index.meta();
    IndexInfo {
        vocabulary: meta.vocabulary.clone(),
        title: meta.title.clone(),
        release: meta.release.clone(),
        coverage_from: meta.coverage_from.to_string(),
        coverage_to: meta.coverage_to.to_string(),
        sources: meta
            .sources
            .iter()
            .map(|s| SourceInfo {
                file: s.file.clone(),
                sha256: s.sha256.clone(),
                role: s.role.clone(),
            })
            .collect(),
        notice: meta.notice.clone(),
        byte_length,
        sha256,
    }
}

/// What a notes file says about itself (the index it belongs to), plus
/// its size and content SHA-256: the manifest the page fetches it by.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq, Eq)]
pub struct NotesInfo {
    /// Always `notes`.
    pub kind: String,
    pub vocabulary: String,
    pub release: String,
    /// Content SHA-256 of the index the notes belong to.
    pub index_sha256: String,
    pub byte_length: u64,
    /// SHA-256 of the notes file's content (everything after the header).
    pub sha256: String,
}

/// Describe an opened notes file of the given size.
pub fn describe_notes<D: AsRef<[u8]>>(
    notes: &rollcall::NotesFile<D>,
    byte_length: u64,
) -> NotesInfo {
    NotesInfo {
        kind: "notes".into(),
        vocabulary: notes.vocabulary().to_string(),
        release: notes.release().to_string(),
        index_sha256: notes.index_checksum(),
        byte_length,
        sha256: notes.checksum(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sha256_hex_is_lower_case_hex() {
        // FIPS 180-2, appendix B.1: SHA-256 of "abc".
        assert_eq!(
            sha256_hex_of(b"abc"),
            "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
        );
    }
}
