//! JSON of any shape: FHIR ValueSet (`compose.include[].concept[]`,
//! `expansion.contains[]`), CodeSystem `concept[]`, Bundles and resources
//! with `coding[]`, and any other JSON whose values are codes under keys
//! such as `code`, `icd10cm` or `icd10`, or arrays of codes. A small parser
//! of its own keeps the line of every string, so each code is reported on
//! the line it was written on.

use super::text::read_line;
use super::tokens::{strength, Strength};
use super::{lines_of, Draft, InputLine, LineKind, Place, Reading};

/// Deepest nesting read; deeper JSON is refused with a message rather than
/// risking the stack.
const MAX_DEPTH: usize = 200;

/// A JSON value with the place of each string.
#[derive(Debug)]
enum Value {
    Scalar,
    Str(Text),
    Array(Vec<Value>),
    Object(Vec<(String, Value)>),
}

/// A string as read, with where its contents start.
#[derive(Debug)]
struct Text {
    value: String,
    /// 0-based line and the byte offset of the contents in that line; the
    /// range is exact only when the string has no escapes (`raw`).
    line: usize,
    column: usize,
    raw: bool,
}

struct Parser<'a> {
    s: &'a [u8],
    i: usize,
    line: usize,
    line_start: usize,
}

type Fail = (usize, String);

impl<'a> Parser<'a> {
    fn fail<T>(&self, what: &str) -> Result<T, Fail> {
        Err((self.line, what.to_string()))
    }

    fn ws(&mut self) {
        while let Some(&c) = self.s.get(self.i) {
            match c {
                b'\n' => {
                    self.i += 1;
                    self.line += 1;
                    self.line_start = self.i;
                }
                b'\r' => {
                    self.i += 1;
                    if self.s.get(self.i) != Some(&b'\n') {
                        self.line += 1;
                        self.line_start = self.i;
                    }
                }
                b' ' | b'\t' => self.i += 1,
                _ => break,
            }
        }
    }

    fn value(&mut self, depth: usize) -> Result<Value, Fail> {
        if depth > MAX_DEPTH {
            return self.fail("the JSON nests deeper than rollcall reads (200 levels)");
        }
        self.ws();
        match self.s.get(self.i) {
            Some(b'{') => {
                self.i += 1;
                let mut fields = Vec::new();
                self.ws();
                if self.s.get(self.i) == Some(&b'}') {
                    self.i += 1;
                    return Ok(Value::Object(fields));
                }
                loop {
                    self.ws();
                    if self.s.get(self.i) != Some(&b'"') {
                        return self.fail("a key in quotes was expected");
                    }
                    let key = self.string()?.value;
                    self.ws();
                    if self.s.get(self.i) != Some(&b':') {
                        return self.fail("a colon after the key was expected");
                    }
                    self.i += 1;
                    let v = self.value(depth + 1)?;
                    fields.push((key, v));
                    self.ws();
                    match self.s.get(self.i) {
                        Some(b',') => self.i += 1,
                        Some(b'}') => {
                            self.i += 1;
                            return Ok(Value::Object(fields));
                        }
                        _ => return self.fail("a comma or a closing } was expected"),
                    }
                }
            }
            Some(b'[') => {
                self.i += 1;
                let mut items = Vec::new();
                self.ws();
                if self.s.get(self.i) == Some(&b']') {
                    self.i += 1;
                    return Ok(Value::Array(items));
                }
                loop {
                    items.push(self.value(depth + 1)?);
                    self.ws();
                    match self.s.get(self.i) {
                        Some(b',') => self.i += 1,
                        Some(b']') => {
                            self.i += 1;
                            return Ok(Value::Array(items));
                        }
                        _ => return self.fail("a comma or a closing ] was expected"),
                    }
                }
            }
            Some(b'"') => Ok(Value::Str(self.string()?)),
            Some(c) if c.is_ascii_digit() || *c == b'-' => {
                while self.s.get(self.i).is_some_and(|c| {
                    c.is_ascii_digit() || matches!(c, b'-' | b'+' | b'.' | b'e' | b'E')
                }) {
                    self.i += 1;
                }
                Ok(Value::Scalar)
            }
            _ => {
                for word in [&b"true"[..], b"false", b"null"] {
                    if self.s[self.i..].starts_with(word) {
                        self.i += word.len();
                        return Ok(Value::Scalar);
                    }
                }
                self.fail("a value was expected")
            }
        }
    }

    fn string(&mut self) -> Result<Text, Fail> {
        self.i += 1;
        let (line, column) = (self.line, self.i - self.line_start);
        let mut raw = true;
        let mut out = Vec::new();
        loop {
            match self.s.get(self.i) {
                None | Some(b'\n') | Some(b'\r') => return self.fail("a string is not closed"),
                Some(b'"') => {
                    self.i += 1;
                    break;
                }
                Some(b'\\') => {
                    raw = false;
                    let esc = self.s.get(self.i + 1).copied();
                    self.i += 2;
                    match esc {
                        Some(b'n') | Some(b't') | Some(b'r') | Some(b'b') | Some(b'f') => {
                            out.push(b' ')
                        }
                        Some(b'u') => {
                            let hex = self
                                .s
                                .get(self.i..self.i + 4)
                                .and_then(|h| std::str::from_utf8(h).ok());
                            let ch = hex
                                .and_then(|h| u32::from_str_radix(h, 16).ok())
                                .and_then(char::from_u32)
                                .unwrap_or('\u{fffd}');
                            self.i += 4;
                            let mut b = [0; 4];
                            out.extend_from_slice(ch.encode_utf8(&mut b).as_bytes());
                        }
                        Some(c) => out.push(c),
                        None => return self.fail("a string is not closed"),
                    }
                }
                Some(&c) => {
                    out.push(c);
                    self.i += 1;
                }
            }
        }
        Ok(Text {
            value: String::from_utf8_lossy(&out).into_owned(),
            line,
            column,
            raw,
        })
    }
}

fn parse(text: &str) -> Result<Value, Fail> {
    let body = text.strip_prefix('\u{feff}').unwrap_or(text);
    let mut p = Parser {
        s: body.as_bytes(),
        i: 0,
        line: 0,
        line_start: 0,
    };
    let v = p.value(0)?;
    p.ws();
    if p.i < p.s.len() {
        return p.fail("the JSON goes on after its end");
    }
    Ok(v)
}

fn squeeze(key: &str) -> String {
    key.chars()
        .filter(|c| c.is_ascii_alphanumeric())
        .collect::<String>()
        .to_ascii_lowercase()
}

/// Keys whose string values are codes, however they look (compared without
/// case, `_` or `-`).
fn code_key(key: &str) -> bool {
    let k = squeeze(key);
    matches!(
        k.as_str(),
        "code"
            | "codes"
            | "icd"
            | "icd10"
            | "icd10cm"
            | "icd10pcs"
            | "icd9"
            | "icd9cm"
            | "dx"
            | "dxcode"
            | "diagnosis"
            | "diagnosiscode"
            | "procedurecode"
            | "hpo"
            | "hpoid"
            | "loinc"
            | "conceptcode"
            | "conceptid"
    ) || k.ends_with("code") && k.len() <= 16 && !k.contains("system")
}

/// Keys that never hold a code, even when the value looks like one.
fn never_code(key: &str) -> bool {
    let k = squeeze(key);
    matches!(
        k.as_str(),
        "system"
            | "version"
            | "url"
            | "id"
            | "date"
            | "status"
            | "resourcetype"
            | "publisher"
            | "copyright"
            | "fullurl"
            | "reference"
            | "value"
            | "valuestring"
            | "count"
            | "total"
            | "offset"
    )
}

const LABEL_KEYS: &[&str] = &[
    "display",
    "description",
    "desc",
    "name",
    "label",
    "text",
    "title",
    "term",
];
const SYSTEM_KEYS: &[&str] = &[
    "system",
    "codesystem",
    "codingsystem",
    "vocabulary",
    "terminology",
];

fn field<'v>(fields: &'v [(String, Value)], keys: &[&str]) -> Option<&'v Text> {
    keys.iter().find_map(|k| {
        fields.iter().find_map(|(name, v)| match v {
            Value::Str(t) if squeeze(name) == *k && !t.value.trim().is_empty() => Some(t),
            _ => None,
        })
    })
}

/// One code found in the JSON.
struct Hit {
    line: usize,
    span: Option<(usize, usize)>,
    code: String,
    label: Option<String>,
    system: Option<String>,
}

struct Walk<'t> {
    lines: &'t [&'t str],
    hits: Vec<Hit>,
    /// Codes under `compose.exclude`, not read into the list.
    excluded: usize,
}

impl Walk<'_> {
    fn take(&mut self, t: &Text, label: Option<String>, system: Option<String>) {
        let code = t.value.trim();
        if code.is_empty() {
            return;
        }
        let lead = t.value.len() - t.value.trim_start().len();
        let span = t
            .raw
            .then(|| (t.column + lead, t.column + lead + code.len()));
        self.hits.push(Hit {
            line: t.line,
            span: span.filter(|&(s, e)| {
                self.lines
                    .get(t.line)
                    .is_some_and(|l| l.get(s..e) == Some(code))
            }),
            code: code.to_string(),
            label,
            system,
        });
    }

    /// Codes inside a longer string (a sentence in an answer): read as a
    /// draft line, strong shapes only.
    fn prose(&mut self, t: &Text, system: Option<&str>) {
        if !t.value.contains(|c: char| c.is_ascii_digit()) {
            return;
        }
        let mut ctx = None;
        let mut found = Vec::new();
        read_line(&t.value, 1, &mut ctx, &mut found);
        for l in found {
            if let LineKind::Entry {
                code,
                label,
                system: s,
            } = l.kind
            {
                if strength(&code) < Strength::Strong {
                    continue;
                }
                let span = l
                    .place
                    .span
                    .filter(|_| t.raw)
                    .map(|(s, e)| (t.column + s, t.column + e));
                self.hits.push(Hit {
                    line: t.line,
                    span,
                    code,
                    label,
                    system: s.or_else(|| system.map(str::to_string)),
                });
            }
        }
    }

    fn value(&mut self, v: &Value, key: &str, system: Option<&str>, in_exclude: bool) {
        match v {
            Value::Scalar => {}
            Value::Str(t) => {
                if never_code(key) || LABEL_KEYS.contains(&squeeze(key).as_str()) {
                    return;
                }
                let whole = t.value.trim();
                let s = strength(whole);
                if code_key(key) && !whole.contains(char::is_whitespace)
                    || s >= Strength::Listed && key.is_empty()
                    || s == Strength::Strong
                {
                    self.take(t, None, system.map(str::to_string));
                } else {
                    self.prose(t, system);
                }
            }
            Value::Array(items) => {
                for item in items {
                    // Strings in an array are literals set apart: a listed
                    // shape is enough (`["250.00", "401.9"]`).
                    match item {
                        Value::Str(t) if !never_code(key) => {
                            let whole = t.value.trim();
                            if strength(whole) >= Strength::Listed
                                || code_key(key) && !whole.contains(char::is_whitespace)
                            {
                                if in_exclude {
                                    self.excluded += 1;
                                } else {
                                    self.take(t, None, system.map(str::to_string));
                                }
                            } else {
                                self.prose(t, system);
                            }
                        }
                        _ => self.value(item, key, system, in_exclude),
                    }
                }
            }
            Value::Object(fields) => {
                let resource = fields.iter().find_map(|(k, v)| match v {
                    Value::Str(t) if k == "resourceType" => Some(t.value.as_str()),
                    _ => None,
                });
                let own = field(fields, SYSTEM_KEYS)
                    .map(|t| t.value.trim().to_string())
                    .or_else(|| {
                        (resource == Some("CodeSystem"))
                            .then(|| field(fields, &["url"]).map(|t| t.value.trim().to_string()))
                            .flatten()
                    });
                let system = own.as_deref().or(system);
                let label = field(fields, LABEL_KEYS).map(|t| t.value.trim().to_string());
                for (k, child) in fields {
                    let exclude = in_exclude || k == "exclude";
                    match child {
                        Value::Str(t) if code_key(k) && !never_code(k) => {
                            let whole = t.value.trim();
                            if whole.is_empty() || whole.split_whitespace().count() > 3 {
                                self.prose(t, system);
                            } else if exclude {
                                self.excluded += 1;
                            } else {
                                self.take(t, label.clone(), system.map(str::to_string));
                            }
                        }
                        _ if LABEL_KEYS.contains(&squeeze(k).as_str())
                            || SYSTEM_KEYS.contains(&squeeze(k).as_str()) => {}
                        _ => self.value(child, k, system, exclude),
                    }
                }
            }
        }
    }
}

fn form_of(v: &Value) -> &'static str {
    if let Value::Object(fields) = v {
        let rt = fields.iter().find_map(|(k, v)| match v {
            Value::Str(t) if k == "resourceType" => Some(t.value.as_str()),
            _ => None,
        });
        return match rt {
            Some("ValueSet") => "fhir valueset",
            Some("CodeSystem") => "fhir codesystem",
            Some("Bundle") => "fhir bundle",
            Some(_) => "fhir resource",
            None => "json",
        };
    }
    "json"
}

/// Reads JSON, or `None` when the text is not JSON.
pub fn try_read(text: &str) -> Option<Draft> {
    let v = parse(text).ok()?;
    Some(from_value(text, &v, false))
}

/// Reads JSON; JSON that cannot be parsed gives one line that says where
/// and why, and every other line as text.
pub fn read(text: &str, forced: bool) -> Draft {
    match parse(text) {
        Ok(v) => from_value(text, &v, forced),
        Err((at, why)) => {
            let lines: Vec<&str> = lines_of(text).collect();
            let out = lines
                .iter()
                .enumerate()
                .map(|(i, l)| {
                    let kind = if i == at {
                        LineKind::Unreadable(format!(
                            "the JSON cannot be read here: {why}; fix it, or read the list as text to find the codes in it anyway"
                        ))
                    } else if l.trim().is_empty() {
                        LineKind::Blank
                    } else {
                        LineKind::Text
                    };
                    InputLine::new(i + 1, l, kind)
                })
                .collect();
            Draft::finish(out, Reading::Json, "json", forced, lines.len())
        }
    }
}

fn from_value(text: &str, v: &Value, forced: bool) -> Draft {
    let lines: Vec<&str> = lines_of(text).collect();
    let mut walk = Walk {
        lines: &lines,
        hits: Vec::new(),
        excluded: 0,
    };
    walk.value(v, "", None, false);
    let mut hits = walk.hits;
    hits.sort_by_key(|h| (h.line, h.span.map_or(0, |s| s.0)));
    let mut out = Vec::with_capacity(lines.len() + hits.len());
    let mut k = 0;
    for (i, l) in lines.iter().enumerate() {
        let before = out.len();
        while k < hits.len() && hits[k].line == i {
            let h = &hits[k];
            out.push(InputLine {
                number: i + 1,
                text: l.to_string(),
                kind: LineKind::Entry {
                    code: h.code.clone(),
                    label: h.label.clone(),
                    system: h.system.clone(),
                },
                place: Place {
                    span: h.span,
                    ..Place::default()
                },
            });
            k += 1;
        }
        if out.len() == before {
            let kind = if l.trim().is_empty() {
                LineKind::Blank
            } else {
                LineKind::Text
            };
            out.push(InputLine::new(i + 1, l, kind));
        }
    }
    let mut d = Draft::finish(out, Reading::Json, form_of(v), forced, lines.len());
    if walk.excluded > 0 {
        d.facts.notes.push(format!(
            "the ValueSet's compose.exclude names {} code(s); they are left out of the list, as the ValueSet leaves them out",
            walk.excluded
        ));
    }
    d
}

#[cfg(test)]
mod tests {
    use super::*;

    fn got(text: &str) -> Vec<(usize, String, Option<String>, Option<String>)> {
        try_read(text)
            .expect("JSON")
            .lines
            .into_iter()
            .filter_map(|l| match l.kind {
                LineKind::Entry {
                    code,
                    label,
                    system,
                } => Some((l.number, code, label, system)),
                _ => None,
            })
            .collect()
    }

    /// The layout of a FHIR R4 ValueSet (hl7.org/fhir/R4/valueset.html):
    /// compose.include[].system with concept[].code and .display.
    #[test]
    fn fhir_valueset_compose_and_expansion() {
        let vs = r#"{
  "resourceType": "ValueSet",
  "version": "2024",
  "compose": {
    "include": [
      { "system": "http://hl7.org/fhir/sid/icd-10-cm",
        "concept": [
          { "code": "E11.9", "display": "Type 2 diabetes mellitus without complications" },
          { "code": "I10", "display": "Essential (primary) hypertension" }
        ] }
    ],
    "exclude": [ { "system": "http://hl7.org/fhir/sid/icd-10-cm", "concept": [ { "code": "E11.65" } ] } ]
  },
  "expansion": { "contains": [ { "system": "http://loinc.org", "code": "2345-7", "display": "Glucose" } ] }
}"#;
        let g = got(vs);
        assert_eq!(g.len(), 3, "{g:?}");
        assert_eq!(g[0].0, 8);
        assert_eq!(g[0].1, "E11.9");
        assert_eq!(
            g[0].2.as_deref(),
            Some("Type 2 diabetes mellitus without complications")
        );
        assert_eq!(g[0].3.as_deref(), Some("http://hl7.org/fhir/sid/icd-10-cm"));
        assert_eq!(g[2].3.as_deref(), Some("http://loinc.org"));
        let d = try_read(vs).unwrap();
        assert_eq!(d.facts.form, "fhir valueset");
        assert_eq!(d.facts.notes.len(), 1);
        assert_eq!(d.lines.len(), vs.lines().count());
    }

    #[test]
    fn any_json_with_code_keys_or_arrays_of_codes() {
        let g = got("[{\"icd10cm\": \"E11.9\", \"description\": \"T2DM\"}, {\"code\": \"T2DM\"}]");
        assert_eq!(g.len(), 2);
        assert_eq!(g[0].2.as_deref(), Some("T2DM"));
        assert_eq!(g[1].1, "T2DM");
        let g = got("{\"codes\": [\"250.00\", \"401.9\"], \"note\": \"see E78.5 too\", \"version\": \"2024\"}");
        assert_eq!(
            g.iter().map(|x| x.1.as_str()).collect::<Vec<_>>(),
            ["250.00", "401.9", "E78.5"]
        );
    }

    #[test]
    fn spans_are_exact() {
        let text = "{\"coding\": [{\"system\": \"http://hl7.org/fhir/sid/icd-10-cm\", \"code\": \"E11.9\"}]}";
        let d = try_read(text).unwrap();
        let l = d
            .lines
            .iter()
            .find(|l| matches!(l.kind, LineKind::Entry { .. }))
            .unwrap();
        let (s, e) = l.place.span.unwrap();
        assert_eq!(&l.text[s..e], "E11.9");
    }

    #[test]
    fn bad_json_names_its_line() {
        let d = read("{\n \"code\": \"E11.9\",\n \"x\": \n}", true);
        assert!(d.lines.iter().any(
            |l| matches!(&l.kind, LineKind::Unreadable(m) if m.contains("value was expected"))
                && l.number == 4
        ));
        assert!(try_read(&"[".repeat(100_000)).is_none());
    }
}
