//! The optional `MAPS` section: mappings to or from other vocabularies (the
//! GEMs). Layout: a count, then per mapping its name, title, source and
//! target vocabularies, an `fst` map from source code to the offset of its
//! rows, and the rows (per source: a count, then target code, flag bits,
//! scenario and choice list).

use super::bytes::{In, Out};
use crate::model::{MapFlags, MapRow, Mapping};

/// Encodes the mappings (none: an empty section is not written).
pub fn write(maps: &[Mapping]) -> Result<Vec<u8>, String> {
    let mut out = Out::default();
    out.varint(maps.len() as u32);
    for m in maps {
        out.str(&m.name);
        out.str(&m.title);
        out.str(&m.from);
        out.str(&m.to);
        let mut groups = Out::default();
        let mut builder = fst::MapBuilder::memory();
        let mut i = 0;
        while i < m.rows.len() {
            let source = &m.rows[i].source;
            let n = m.rows[i..]
                .iter()
                .take_while(|r| &r.source == source)
                .count();
            builder
                .insert(source.as_bytes(), groups.buf.len() as u64)
                .map_err(|e| format!("mapping {}: {e} (rows must be sorted by source)", m.name))?;
            groups.varint(n as u32);
            for r in &m.rows[i..i + n] {
                groups.str(&r.target);
                groups.u8(r.flags.approximate as u8
                    | (r.flags.no_map as u8) << 1
                    | (r.flags.combination as u8) << 2);
                groups.u8(r.flags.scenario);
                groups.u8(r.flags.choice_list);
            }
            i += n;
        }
        let fst = builder.into_inner().map_err(|e| e.to_string())?;
        out.varint(fst.len() as u32);
        out.buf.extend_from_slice(&fst);
        out.varint(groups.buf.len() as u32);
        out.buf.extend_from_slice(&groups.buf);
    }
    Ok(out.buf)
}

/// One mapping of an opened index, borrowing the file's bytes.
pub struct MapView<'a> {
    /// Short name.
    pub name: &'a str,
    /// Title.
    pub title: &'a str,
    /// Vocabulary of the sources.
    pub from: &'a str,
    /// Vocabulary of the targets.
    pub to: &'a str,
    map: fst::Map<&'a [u8]>,
    groups: &'a [u8],
}

/// Decodes the section (`None` for a damaged one). With `check`, each
/// mapping's fst is checked against its own checksum (done once, when the
/// index is opened: lookups and streams trust its nodes).
pub fn read(b: &[u8], check: bool) -> Option<Vec<MapView<'_>>> {
    let mut r = In::new(b);
    let n = r.varint()?;
    let mut out = Vec::new();
    for _ in 0..n.min(16) {
        let name = r.str()?;
        let title = r.str()?;
        let from = r.str()?;
        let to = r.str()?;
        let len = r.varint()? as usize;
        let map = fst::Map::new(r.take(len)?).ok()?;
        if check && map.as_fst().verify().is_err() {
            return None;
        }
        let len = r.varint()? as usize;
        let groups = r.take(len)?;
        out.push(MapView {
            name,
            title,
            from,
            to,
            map,
            groups,
        });
    }
    Some(out)
}

impl<'a> MapView<'a> {
    fn rows_at(&self, source: &str, at: usize) -> Vec<MapRow> {
        let mut r = In::new(self.groups);
        r.pos = at;
        let mut out = Vec::new();
        let Some(n) = r.varint() else { return out };
        for _ in 0..n.min(4096) {
            let (Some(t), Some(bits), Some(scenario), Some(choice_list)) =
                (r.str(), r.u8(), r.u8(), r.u8())
            else {
                break;
            };
            out.push(MapRow {
                source: source.to_string(),
                target: t.to_string(),
                flags: MapFlags {
                    approximate: bits & 1 != 0,
                    no_map: bits & 2 != 0,
                    combination: bits & 4 != 0,
                    scenario,
                    choice_list,
                },
            });
        }
        out
    }

    /// The rows of one source code (undotted), in the file's order.
    pub fn lookup(&self, source: &str) -> Vec<MapRow> {
        match self.map.get(source.as_bytes()) {
            Some(at) => self.rows_at(source, at as usize),
            None => Vec::new(),
        }
    }

    /// Every row, sources ascending.
    pub fn rows(&self) -> Vec<MapRow> {
        use fst::Streamer;
        let mut out = Vec::new();
        let mut s = self.map.stream();
        while let Some((k, at)) = s.next() {
            if let Ok(k) = std::str::from_utf8(k) {
                out.extend(self.rows_at(k, at as usize));
            }
        }
        out
    }

    /// How many source codes the mapping has.
    pub fn sources(&self) -> usize {
        self.map.len()
    }
}
