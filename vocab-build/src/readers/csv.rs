//! Reading comma-separated text as RFC 4180 defines it (the LOINC table
//! files): fields may be quoted, a quoted field may hold commas, doubled
//! quotes and line breaks, and each record is kept with the line it starts
//! on, for messages. Also the rows of a tab-separated file with a header
//! (the history and conversion tables).

use crate::error::BuildError;

/// One record: the 1-based line it starts on, and its fields.
pub type Record = (usize, Vec<String>);

/// Splits the text into records. Blank lines are skipped. A quote inside an
/// unquoted field, text after a closing quote, or a quote left open is an
/// error naming the line.
pub fn records(name: &str, text: &str) -> Result<Vec<Record>, BuildError> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let mut out = Vec::new();
    let mut chars = text.chars().peekable();
    let mut line = 1;
    while chars.peek().is_some() {
        let start = line;
        let mut fields = Vec::new();
        let mut field = String::new();
        let mut quoted = false;
        let mut closed = false;
        loop {
            let Some(c) = chars.next() else {
                if quoted && !closed {
                    return Err(BuildError::at(
                        name,
                        start,
                        "a quoted field is never closed; check for a missing \" in this record",
                    ));
                }
                break;
            };
            if quoted && !closed {
                match c {
                    '"' if chars.peek() == Some(&'"') => {
                        chars.next();
                        field.push('"');
                    }
                    '"' => closed = true,
                    '\n' => {
                        line += 1;
                        field.push('\n');
                    }
                    c => field.push(c),
                }
                continue;
            }
            match c {
                ',' => {
                    fields.push(std::mem::take(&mut field));
                    quoted = false;
                    closed = false;
                }
                '\r' if chars.peek() == Some(&'\n') => {}
                '\n' => {
                    line += 1;
                    break;
                }
                '"' if field.is_empty() && !quoted => quoted = true,
                '"' => {
                    return Err(BuildError::at(
                        name,
                        line,
                        "a quote inside a field that is not quoted; quote the whole field and double the quote (\"\")",
                    ))
                }
                c if closed => {
                    return Err(BuildError::at(
                        name,
                        line,
                        format!("\"{c}\" follows a closing quote; a quoted field must end at a comma or the end of the line"),
                    ))
                }
                c => field.push(c),
            }
        }
        fields.push(field);
        if fields.len() == 1 && fields[0].trim().is_empty() && !quoted {
            continue;
        }
        out.push((start, fields));
    }
    Ok(out)
}

/// The position of the column named `want` in a header record.
pub fn column(header: &[String], want: &str) -> Option<usize> {
    header.iter().position(|h| h.trim() == want)
}

/// The rows of a tab-separated text after its header line, each with its
/// 1-based line number and its fields (a `\r` before the line end dropped,
/// blank lines skipped). A header whose fields `fits` refuses is an error at
/// line 1 naming `expected`, the header as it should read.
pub fn tab_rows<'a>(
    name: &str,
    text: &'a str,
    fits: impl Fn(&[&str]) -> bool,
    expected: &str,
) -> Result<impl Iterator<Item = (usize, Vec<&'a str>)>, BuildError> {
    let mut lines = text.lines().enumerate();
    let header = lines.next().map_or("", |(_, l)| l.trim_end_matches('\r'));
    if !fits(&header.split('\t').collect::<Vec<_>>()) {
        return Err(BuildError::at(
            name,
            1,
            format!("expected the header `{expected}`"),
        ));
    }
    Ok(lines.filter_map(|(i, line)| {
        let line = line.trim_end_matches('\r');
        (!line.is_empty()).then(|| (i + 1, line.split('\t').collect()))
    }))
}

#[cfg(test)]
mod tests {
    use super::records;

    /// RFC 4180 section 2: quoted fields with commas, doubled quotes and
    /// line breaks; CRLF line ends.
    #[test]
    fn quoted_fields_and_line_breaks() {
        let t = "a,b,c\r\n\"x, y\",\"say \"\"hi\"\"\",\"two\nlines\"\r\n\r\nlast,,\n";
        let r = records("f.csv", t).unwrap();
        assert_eq!(r.len(), 3);
        assert_eq!(r[1].0, 2);
        assert_eq!(r[1].1, ["x, y", "say \"hi\"", "two\nlines"]);
        assert_eq!(r[2].0, 5);
        assert_eq!(r[2].1, ["last", "", ""]);
    }

    #[test]
    fn bad_quotes_name_the_line() {
        let e = records("f.csv", "a,b\nx,\"open\n").unwrap_err();
        assert_eq!(e.line, Some(2));
        let e = records("f.csv", "a,b\nx,y\"z\n").unwrap_err();
        assert_eq!(e.line, Some(2));
        let e = records("f.csv", "a,b\n\"x\"y,z\n").unwrap_err();
        assert_eq!(e.line, Some(2));
    }
}
