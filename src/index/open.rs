//! Reading the container: the header and section directory, the checksum,
//! and the `META` and `TREE` sections.

use super::*;

/// The sections of a file of the container format (see [`write`]): checks
/// the magic (`None` when it is not `magic`), the version and the length,
/// and reads the directory (tag to offset and length).
#[allow(clippy::type_complexity)]
pub(super) fn container(
    bytes: &[u8],
    magic: &[u8; 8],
) -> Option<Result<std::collections::HashMap<Vec<u8>, Range>, IndexError>> {
    if bytes.len() < 12 || &bytes[..8] != magic {
        return None;
    }
    Some(directory(bytes))
}

pub(super) fn directory(
    bytes: &[u8],
) -> Result<std::collections::HashMap<Vec<u8>, Range>, IndexError> {
    let version = u32_at(bytes, 8).unwrap_or(0);
    if version != FORMAT_VERSION {
        return Err(IndexError::Version {
            expected: FORMAT_VERSION,
            got: version,
        });
    }
    let mut r = In::new(bytes);
    r.pos = 12;
    let count = r.u32().ok_or(IndexError::Corrupt("header"))? as usize;
    let total = r
        .take(8)
        .map(|b| u64::from_le_bytes(b.try_into().unwrap_or([0; 8])))
        .ok_or(IndexError::Truncated {
            expected: HEADER_LEN as u64,
            got: bytes.len() as u64,
        })?;
    if (bytes.len() as u64) < total || bytes.len() < HEADER_LEN {
        return Err(IndexError::Truncated {
            expected: total.max(HEADER_LEN as u64),
            got: bytes.len() as u64,
        });
    }
    if bytes.len() as u64 != total {
        return Err(IndexError::Corrupt("extra bytes after the end"));
    }
    r.pos = HEADER_LEN;
    let mut find = std::collections::HashMap::new();
    for _ in 0..count.min(64) {
        let tag = r.take(4).ok_or(IndexError::Corrupt("directory"))?;
        let off = r.u32().ok_or(IndexError::Corrupt("directory"))? as usize;
        let len = r.u32().ok_or(IndexError::Corrupt("directory"))? as usize;
        if off.checked_add(len).is_none_or(|end| end > bytes.len()) {
            return Err(IndexError::Corrupt("a section lies outside the file"));
        }
        find.insert(tag.to_vec(), (off, len));
    }
    Ok(find)
}

/// Recomputes the content checksum of a container file and compares it
/// with the header's.
pub(super) fn verify_sum(bytes: &[u8]) -> Result<(), IndexError> {
    let got = sha256::digest(bytes.get(HEADER_LEN..).unwrap_or_default());
    verify_stated(bytes, &got)
}

/// Compares `got`, a SHA-256 of the content of a container file (its bytes
/// from [`CONTENT_START`]), with the header's.
pub(super) fn verify_stated(bytes: &[u8], got: &[u8]) -> Result<(), IndexError> {
    let stated = bytes.get(24..HEADER_LEN).unwrap_or_default();
    if got != stated {
        return Err(IndexError::ChecksumMismatch {
            expected: sha256::hex(stated),
            got: sha256::hex(got),
        });
    }
    Ok(())
}

/// The bytes of an optional section, if the directory has it.
pub(super) fn slice_of<'b>(
    bytes: &'b [u8],
    at: &[([u8; 4], (usize, usize))],
    tag: &[u8; 4],
) -> Option<&'b [u8]> {
    at.iter()
        .find(|(t, _)| t == tag)
        .map(|(_, (o, n))| &bytes[*o..*o + *n])
}

pub(super) fn read_meta(b: &[u8]) -> Option<Meta> {
    let mut r = In::new(b);
    let vocabulary = r.str()?.to_string();
    let title = r.str()?.to_string();
    let release = r.str()?.to_string();
    let coverage_from = Date::from_days(r.i32()?);
    let coverage_to = Date::from_days(r.i32()?);
    let dot_after = r.u8()?;
    let n = r.varint()?;
    let mut sources = Vec::new();
    for _ in 0..n.min(1000) {
        sources.push(Source {
            file: r.str()?.to_string(),
            sha256: r.str()?.to_string(),
            role: r.str()?.to_string(),
        });
    }
    let n = r.varint()?;
    let mut shapes = Vec::new();
    for _ in 0..n.min(10_000) {
        shapes.push(r.str()?.to_string());
    }
    let mut dot_rules = Vec::new();
    if r.pos < b.len() {
        let n = r.varint()?;
        for _ in 0..n.min(64) {
            let c = char::from_u32(r.varint()?)?;
            dot_rules.push((c, r.u8()?));
        }
    }
    let notice = if r.pos < b.len() {
        r.str()?.to_string()
    } else {
        String::new()
    };
    Some(Meta {
        vocabulary,
        title,
        release,
        coverage_from,
        coverage_to,
        sources,
        dot_after,
        dot_rules,
        shapes,
        notice,
    })
}

pub(super) fn read_tree(b: &[u8]) -> Option<Tree> {
    let mut r = In::new(b);
    let mut chapters = Vec::new();
    for _ in 0..r.varint()?.min(10_000) {
        chapters.push(Chapter {
            name: r.str()?.to_string(),
            title: r.str()?.to_string(),
        });
    }
    let mut sections = Vec::new();
    for _ in 0..r.varint()?.min(100_000) {
        sections.push(Section {
            first: r.str()?.to_string(),
            last: r.str()?.to_string(),
            title: r.str()?.to_string(),
            chapter: r.u16()?,
        });
    }
    let mut seventh = Vec::new();
    for _ in 0..r.varint()?.min(100_000) {
        let mut extensions = Vec::new();
        for _ in 0..r.varint()?.min(64) {
            let ch = char::from_u32(r.varint()?)?;
            extensions.push((ch, r.str()?.to_string()));
        }
        seventh.push(SeventhRule { extensions });
    }
    Some(Tree {
        chapters,
        sections,
        seventh,
    })
}
