//! A small pull reader for the plain XML the release files use: elements,
//! attributes, text, comments, processing instructions and the five
//! predefined entities (plus numeric ones). No DTDs, no namespaces.

/// One step through the document.
#[derive(Debug, PartialEq)]
pub enum Event<'a> {
    /// `<name attr="v">` (also emitted for `<name/>`, followed by `End`).
    Start(&'a str, Vec<(&'a str, String)>),
    /// `</name>`.
    End(&'a str),
    /// Text between tags, entities decoded, not trimmed.
    Text(String),
}

/// Reads events from a whole document held in memory.
pub struct Reader<'a> {
    src: &'a str,
    pos: usize,
    pending_end: Option<&'a str>,
}

/// A document that does not parse, with the line where it went wrong.
#[derive(Debug)]
pub struct XmlError {
    pub line: usize,
    pub what: &'static str,
}

impl std::fmt::Display for XmlError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "XML line {}: {}", self.line, self.what)
    }
}

impl<'a> Reader<'a> {
    pub fn new(src: &'a str) -> Reader<'a> {
        Reader {
            src,
            pos: 0,
            pending_end: None,
        }
    }

    fn err(&self, what: &'static str) -> XmlError {
        XmlError {
            line: self.src[..self.pos].matches('\n').count() + 1,
            what,
        }
    }

    /// The next event, `Ok(None)` at the end of the document.
    pub fn next(&mut self) -> Result<Option<Event<'a>>, XmlError> {
        if let Some(name) = self.pending_end.take() {
            return Ok(Some(Event::End(name)));
        }
        loop {
            let rest = &self.src[self.pos..];
            if rest.is_empty() {
                return Ok(None);
            }
            if !rest.starts_with('<') {
                let end = rest.find('<').unwrap_or(rest.len());
                self.pos += end;
                return Ok(Some(Event::Text(decode(&rest[..end]))));
            }
            if rest.starts_with("<!--") {
                let end = rest
                    .find("-->")
                    .ok_or_else(|| self.err("unclosed comment"))?;
                self.pos += end + 3;
                continue;
            }
            if rest.starts_with("<![CDATA[") {
                let end = rest.find("]]>").ok_or_else(|| self.err("unclosed CDATA"))?;
                self.pos += end + 3;
                return Ok(Some(Event::Text(rest[9..end].to_string())));
            }
            if rest.starts_with("<?") || rest.starts_with("<!") {
                let end = rest
                    .find('>')
                    .ok_or_else(|| self.err("unclosed declaration"))?;
                self.pos += end + 1;
                continue;
            }
            let end = find_tag_end(rest).ok_or_else(|| self.err("unclosed tag"))?;
            let tag = &rest[1..end];
            self.pos += end + 1;
            if let Some(name) = tag.strip_prefix('/') {
                return Ok(Some(Event::End(name.trim())));
            }
            let (tag, empty) = match tag.strip_suffix('/') {
                Some(t) => (t, true),
                None => (tag, false),
            };
            let name_end = tag.find(|c: char| c.is_whitespace()).unwrap_or(tag.len());
            let name = &tag[..name_end];
            let attrs = parse_attrs(&tag[name_end..]).ok_or_else(|| self.err("bad attribute"))?;
            if empty {
                self.pending_end = Some(name);
            }
            return Ok(Some(Event::Start(name, attrs)));
        }
    }
}

fn find_tag_end(s: &str) -> Option<usize> {
    let mut quote = None;
    for (i, c) in s.char_indices() {
        match (quote, c) {
            (None, '"' | '\'') => quote = Some(c),
            (Some(q), c) if c == q => quote = None,
            (None, '>') => return Some(i),
            _ => {}
        }
    }
    None
}

fn parse_attrs(mut s: &str) -> Option<Vec<(&str, String)>> {
    let mut out = Vec::new();
    loop {
        s = s.trim_start();
        if s.is_empty() {
            return Some(out);
        }
        let eq = s.find('=')?;
        let name = s[..eq].trim();
        s = s[eq + 1..].trim_start();
        let q = s.chars().next()?;
        if q != '"' && q != '\'' {
            return None;
        }
        let end = s[1..].find(q)? + 1;
        out.push((name, decode(&s[1..end])));
        s = &s[end + 1..];
    }
}

/// Decodes the predefined and numeric character references.
pub fn decode(s: &str) -> String {
    if !s.contains('&') {
        return s.to_string();
    }
    let mut out = String::with_capacity(s.len());
    let mut rest = s;
    while let Some(i) = rest.find('&') {
        out.push_str(&rest[..i]);
        rest = &rest[i..];
        let Some(semi) = rest.find(';').filter(|&n| n < 12) else {
            out.push('&');
            rest = &rest[1..];
            continue;
        };
        let ent = &rest[1..semi];
        let ch = match ent {
            "amp" => Some('&'),
            "lt" => Some('<'),
            "gt" => Some('>'),
            "quot" => Some('"'),
            "apos" => Some('\''),
            _ => ent
                .strip_prefix("#x")
                .and_then(|h| u32::from_str_radix(h, 16).ok())
                .or_else(|| ent.strip_prefix('#').and_then(|d| d.parse().ok()))
                .and_then(char::from_u32),
        };
        match ch {
            Some(c) => {
                out.push(c);
                rest = &rest[semi + 1..];
            }
            None => {
                out.push('&');
                rest = &rest[1..];
            }
        }
    }
    out.push_str(rest);
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_elements_attributes_and_entities() {
        let mut r =
            Reader::new("<?xml version=\"1.0\"?><!-- c --><a x=\"1 &amp; 2\"><b/>T &lt; U</a>");
        let mut ev = Vec::new();
        while let Some(e) = r.next().unwrap() {
            ev.push(e);
        }
        assert_eq!(
            ev,
            vec![
                Event::Start("a", vec![("x", "1 & 2".to_string())]),
                Event::Start("b", vec![]),
                Event::End("b"),
                Event::Text("T < U".to_string()),
                Event::End("a"),
            ]
        );
    }

    #[test]
    fn reports_the_line_of_an_unclosed_tag() {
        let mut r = Reader::new("<a>\n\n<b");
        assert!(matches!(r.next(), Ok(Some(Event::Start("a", _)))));
        let _ = r.next();
        let e = r.next().unwrap_err();
        assert_eq!(e.line, 3);
    }
}
