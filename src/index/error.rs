//! What can be wrong with an index file, each a sentence a user can act on.

use super::*;

/// Why index bytes cannot be used. Each message says what to do.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum IndexError {
    /// Not an index file at all.
    NotAnIndex,
    /// A notes file where an index was expected.
    NotesNotIndex,
    /// Not a notes file (an index, or something else) where a notes file was expected.
    NotNotes,
    /// A notes file written for another index.
    NotesOfAnotherIndex {
        /// The vocabulary and release the notes file names.
        notes: String,
        /// The vocabulary and release of the index.
        index: String,
    },
    /// Written by another format version.
    Version {
        /// The version this build reads.
        expected: u32,
        /// The version in the file.
        got: u32,
    },
    /// Shorter than its header says.
    Truncated {
        /// Length stated in the header.
        expected: u64,
        /// Bytes present.
        got: u64,
    },
    /// A part of the file is missing or out of bounds.
    Corrupt(&'static str),
    /// The content does not match its checksum.
    ChecksumMismatch {
        /// Checksum in the header.
        expected: String,
        /// Checksum of the content.
        got: String,
    },
}

impl fmt::Display for IndexError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            IndexError::NotAnIndex => write!(
                f,
                "this is not a rollcall index file (its first bytes are wrong); \
                 point to a file written by vocab-build"
            ),
            IndexError::NotesNotIndex => write!(
                f,
                "this is a notes file (the tabular list's notes of an index), not an index; \
                 point to the index file itself"
            ),
            IndexError::NotNotes => write!(
                f,
                "this is not a rollcall notes file (its first bytes are wrong); \
                 point to the notes file vocab-build wrote beside the index"
            ),
            IndexError::NotesOfAnotherIndex { notes, index } => write!(
                f,
                "the notes file was written for {notes}, not for this index ({index}); \
                 use the notes file vocab-build wrote with this index"
            ),
            IndexError::Version { expected, got } => write!(
                f,
                "the index file has format version {got}, but this rollcall reads version \
                 {expected}; rebuild the index with the matching vocab-build"
            ),
            IndexError::Truncated { expected, got } => write!(
                f,
                "the index file is truncated: {got} of {expected} bytes are present; \
                 copy or download it again"
            ),
            IndexError::Corrupt(what) => write!(
                f,
                "the index file is damaged ({what}); rebuild it with vocab-build or copy it again"
            ),
            IndexError::ChecksumMismatch { expected, got } => write!(
                f,
                "the index file is corrupted: its checksum is {got} but should be {expected}; \
                 copy or download it again"
            ),
        }
    }
}

impl std::error::Error for IndexError {}
