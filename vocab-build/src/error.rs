//! The one error type of vocab-build: which file, which line, what to do.

use std::fmt;

/// A source file that cannot be used as it is.
#[derive(Debug)]
pub struct BuildError {
    /// File name as given.
    pub file: String,
    /// 1-based line, when the problem is on one line.
    pub line: Option<usize>,
    /// A sentence saying what is wrong and what to do.
    pub message: String,
}

impl BuildError {
    pub fn at(file: &str, line: usize, message: impl Into<String>) -> BuildError {
        BuildError {
            file: file.to_string(),
            line: Some(line),
            message: message.into(),
        }
    }
    pub fn file(file: &str, message: impl Into<String>) -> BuildError {
        BuildError {
            file: file.to_string(),
            line: None,
            message: message.into(),
        }
    }
}

impl fmt::Display for BuildError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.line {
            Some(l) => write!(f, "{} line {}: {}", self.file, l, self.message),
            None => write!(f, "{}: {}", self.file, self.message),
        }
    }
}

impl std::error::Error for BuildError {}
