//! The CDC ICD-10-CM Tabular List XML: chapters, sections with their
//! category ranges, and every `diag` node (categories, subcategories, codes)
//! with its description and any 7th-character rule stated at it.

use super::xml::{Event, Reader, XmlError};
use rollcall::model::{Chapter, NoteKind, Section};
use crate::formats::{in_force, Builds, Format, Takes};

/// One `diag` element.
#[derive(Debug, Clone)]
pub struct Node {
    /// Undotted code (`H211X` for `H21.1X`).
    pub code: String,
    /// Its `desc`.
    pub description: String,
    /// `sevenChrDef` extensions stated at this node.
    pub seventh: Option<Vec<(char, String)>>,
    /// The notes of its `inclusionTerm` and `includes` (other wordings of the code).
    pub terms: Vec<String>,
    /// Every instructional note stated at it, in document order.
    pub notes: Vec<(NoteKind, String)>,
}

/// A whole tabular file.
#[derive(Debug, Default)]
pub struct Tabular {
    /// The `version` element.
    pub version: String,
    /// Chapters in order.
    pub chapters: Vec<Chapter>,
    /// Sections in order (from each chapter's section index).
    pub sections: Vec<Section>,
    /// Every diag node, in document order.
    pub nodes: Vec<Node>,
    /// Notes stated at a chapter (index into `chapters`), in document order.
    pub chapter_notes: Vec<(u16, NoteKind, String)>,
    /// Notes stated at a section, by its category range (`first`, `last`,
    /// undotted): a block the section index lists, or a wider one around
    /// several (`C00-C96`), in document order.
    pub section_notes: Vec<(String, String, NoteKind, String)>,
}

/// Reads the tabular XML.
pub fn parse(text: &str) -> Result<Tabular, XmlError> {
    let mut r = Reader::new(text);
    let mut out = Tabular::default();
    let mut path: Vec<String> = Vec::new();
    // Open diag nodes (index into out.nodes).
    let mut diags: Vec<usize> = Vec::new();
    let mut text_buf = String::new();
    let mut section_ref: Option<(String, String)> = None;
    let mut extension: Option<char> = None;
    // The category range of the open `section` element.
    let mut section: Option<(String, String)> = None;
    while let Some(ev) = r.next()? {
        match ev {
            Event::Start(name, attrs) => {
                text_buf.clear();
                match name {
                    "chapter" => out.chapters.push(Chapter {
                        name: String::new(),
                        title: String::new(),
                    }),
                    "section" => {
                        section = attrs.iter().find(|(n, _)| *n == "id").map(|(_, v)| {
                            let v = v.replace('.', "");
                            match v.split_once('-') {
                                Some((a, b)) => (a.to_string(), b.to_string()),
                                None => (v.clone(), v),
                            }
                        });
                    }
                    "diag" => {
                        out.nodes.push(Node {
                            code: String::new(),
                            description: String::new(),
                            seventh: None,
                            terms: Vec::new(),
                            notes: Vec::new(),
                        });
                        diags.push(out.nodes.len() - 1);
                    }
                    "sectionRef" => {
                        let get = |k: &str| {
                            attrs
                                .iter()
                                .find(|(n, _)| *n == k)
                                .map(|(_, v)| v.replace('.', ""))
                                .unwrap_or_default()
                        };
                        section_ref = Some((get("first"), get("last")));
                    }
                    "sevenChrDef" => {
                        if let Some(&d) = diags.last() {
                            out.nodes[d].seventh = Some(Vec::new());
                        }
                    }
                    "extension" => {
                        extension = attrs
                            .iter()
                            .find(|(n, _)| *n == "char")
                            .and_then(|(_, v)| v.chars().next());
                    }
                    _ => {}
                }
                path.push(name.to_string());
            }
            Event::Text(t) => text_buf.push_str(&t),
            Event::End(name) => {
                path.pop();
                let parent = path.last().map(String::as_str);
                let value = text_buf.split_whitespace().collect::<Vec<_>>().join(" ");
                match (name, parent) {
                    ("version", Some("ICD10CM.tabular")) => out.version = value,
                    ("name", Some("chapter")) => {
                        if let Some(c) = out.chapters.last_mut() {
                            c.name = value;
                        }
                    }
                    ("desc", Some("chapter")) => {
                        if let Some(c) = out.chapters.last_mut() {
                            c.title = value;
                        }
                    }
                    ("name", Some("diag")) => {
                        if let Some(&d) = diags.last() {
                            out.nodes[d].code = value.replace('.', "").to_ascii_uppercase();
                        }
                    }
                    ("desc", Some("diag")) => {
                        if let Some(&d) = diags.last() {
                            out.nodes[d].description = value;
                        }
                    }
                    ("note", Some(el @ ("inclusionTerm" | "includes")))
                        if path.get(path.len().wrapping_sub(2)).map(String::as_str)
                            == Some("diag") =>
                    {
                        if let (Some(&d), Some(kind)) = (diags.last(), NoteKind::of_element(el)) {
                            if !value.is_empty() {
                                out.nodes[d].notes.push((kind, value.clone()));
                                out.nodes[d].terms.push(value);
                            }
                        }
                    }
                    ("note", Some(kind)) if NoteKind::of_element(kind).is_some() => {
                        let kind = NoteKind::of_element(kind).unwrap_or(NoteKind::Note);
                        let owner = path.get(path.len().wrapping_sub(2)).map(String::as_str);
                        match owner {
                            _ if value.is_empty() => {}
                            Some("diag") => {
                                if let Some(&d) = diags.last() {
                                    out.nodes[d].notes.push((kind, value));
                                }
                            }
                            Some("section") => {
                                if let Some((a, b)) = &section {
                                    out.section_notes.push((a.clone(), b.clone(), kind, value));
                                }
                            }
                            Some("chapter") if !out.chapters.is_empty() => {
                                let c = out.chapters.len() as u16 - 1;
                                out.chapter_notes.push((c, kind, value));
                            }
                            _ => {}
                        }
                    }
                    ("section", _) => section = None,
                    ("extension", _) => {
                        if let (Some(ch), Some(&d)) = (extension.take(), diags.last()) {
                            if let Some(rule) = out.nodes[d].seventh.as_mut() {
                                rule.push((ch, value));
                            }
                        }
                    }
                    ("sectionRef", _) => {
                        if let Some((first, last)) = section_ref.take() {
                            out.sections.push(Section {
                                first,
                                last,
                                title: value,
                                chapter: out.chapters.len().saturating_sub(1) as u16,
                            });
                        }
                    }
                    ("diag", _) => {
                        diags.pop();
                    }
                    _ => {}
                }
                text_buf.clear();
            }
        }
    }
    out.nodes.retain(|n| !n.code.is_empty());
    Ok(out)
}

/// `--tabular FILE@PERIOD`: a tree in force for the period, with the
/// chapters, sections, 7th-character rules and notes.
pub const FORMAT: Format = Format {
    flag: "--tabular",
    takes: Takes::Dated,
    reads: "CDC tabular XML (hierarchy, chapters, sections, 7th characters)",
    builds: Builds::Part {
        role: "hierarchy",
        add: |inp, l, period| {
            let p = in_force(period, "--tabular")?;
            let t = parse(&l.text).map_err(|x| format!("{}: {x}", l.name))?;
            let said = format!(
                "version {}, {} chapters, {} sections, {} nodes, {} with 7th-character rules",
                t.version,
                t.chapters.len(),
                t.sections.len(),
                t.nodes.len(),
                t.nodes.iter().filter(|n| n.seventh.is_some()).count()
            );
            inp.tabulars.push((p, t));
            Ok(said)
        },
    },
};

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_a_small_tabular() {
        let t = parse(
            r#"<ICD10CM.tabular><version>2026</version>
            <chapter><name>19</name><desc>Injury (S00-T88)</desc>
            <includes><note>injuries of all kinds</note></includes>
            <sectionIndex><sectionRef first="S00" last="S09" id="S00-S09">Injuries to the head</sectionRef></sectionIndex>
            <section id="S00-S09"><desc>Injuries to the head (S00-S09)</desc>
            <excludes2><note>burns (T20-T32)</note></excludes2>
            <diag><name>S06</name><desc>Intracranial injury</desc>
              <sevenChrDef><extension char="A">initial encounter</extension><extension char="S">sequela</extension></sevenChrDef>
              <diag><name>S06.0X</name><desc>Concussion</desc>
                <inclusionTerm><note>Commotio cerebri</note></inclusionTerm>
                <excludes1><note>not this</note></excludes1></diag>
            </diag></section></chapter></ICD10CM.tabular>"#,
        )
        .unwrap();
        assert_eq!(t.version, "2026");
        assert_eq!(t.chapters[0].name, "19");
        assert_eq!(t.sections[0].first, "S00");
        assert_eq!(t.sections[0].title, "Injuries to the head");
        assert_eq!(t.nodes.len(), 2);
        assert_eq!(t.nodes[1].code, "S060X");
        assert_eq!(t.nodes[1].terms, ["Commotio cerebri"]);
        assert_eq!(
            t.nodes[1].notes,
            [
                (NoteKind::InclusionTerm, "Commotio cerebri".to_string()),
                (NoteKind::Excludes1, "not this".to_string())
            ]
        );
        assert_eq!(
            t.chapter_notes,
            [(0, NoteKind::Includes, "injuries of all kinds".to_string())]
        );
        assert_eq!(
            t.section_notes,
            [(
                "S00".to_string(),
                "S09".to_string(),
                NoteKind::Excludes2,
                "burns (T20-T32)".to_string()
            )]
        );
        let rule = t.nodes[0].seventh.as_ref().unwrap();
        assert_eq!(rule[1], ('S', "sequela".to_string()));
    }
}
