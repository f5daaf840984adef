//! Drug code shapes: NDC and RxNorm identifiers.

use super::{all_digits, fails, fits, Shape};

/// The segment layout an NDC was written in.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum NdcForm {
    /// 10 digits, labeler 4, product 4, package 2.
    Ten442,
    /// 10 digits, 5-3-2.
    Ten532,
    /// 10 digits, 5-4-1.
    Ten541,
    /// 11 digits, 5-4-2 (the form billing uses).
    Eleven542,
}

impl NdcForm {
    fn segments(self) -> [usize; 3] {
        match self {
            NdcForm::Ten442 => [4, 4, 2],
            NdcForm::Ten532 => [5, 3, 2],
            NdcForm::Ten541 => [5, 4, 1],
            NdcForm::Eleven542 => [5, 4, 2],
        }
    }
    /// `4-4-2` and so on.
    pub fn name(self) -> String {
        let [a, b, c] = self.segments();
        format!("{a}-{b}-{c}")
    }
}

/// One reading of an NDC.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct NdcReading {
    /// The layout.
    pub form: NdcForm,
    /// The 11-digit 5-4-2 form, hyphenated (`00002-1433-80`).
    pub eleven: String,
}

fn to_eleven(segs: [&str; 3]) -> String {
    format!("{:0>5}-{:0>4}-{:0>2}", segs[0], segs[1], segs[2])
}

/// The readings of an NDC as written: one for a hyphenated code or an
/// 11-digit string; three for a hyphen-less 10-digit string, which cannot
/// tell its layout (FDA National Drug Code Directory: a 10-digit NDC is
/// 4-4-2, 5-3-2 or 5-4-1; for billing it is padded to 11 digits, 5-4-2, with
/// a leading zero in the short segment; common practice). Empty when the
/// text is not an NDC shape.
pub fn ndc(c: &str) -> Vec<NdcReading> {
    let forms = [
        NdcForm::Ten442,
        NdcForm::Ten532,
        NdcForm::Ten541,
        NdcForm::Eleven542,
    ];
    let parts: Vec<&str> = c.split('-').collect();
    if parts.len() == 3 {
        if !parts.iter().all(|p| all_digits(p)) {
            return Vec::new();
        }
        let lens = [parts[0].len(), parts[1].len(), parts[2].len()];
        return forms
            .into_iter()
            .filter(|f| f.segments() == lens)
            .map(|form| NdcReading {
                form,
                eleven: to_eleven([parts[0], parts[1], parts[2]]),
            })
            .collect();
    }
    if parts.len() != 1 || !all_digits(c) {
        return Vec::new();
    }
    let split = |f: NdcForm| {
        let [a, b, _] = f.segments();
        NdcReading {
            form: f,
            eleven: to_eleven([&c[..a], &c[a..a + b], &c[a + b..]]),
        }
    };
    match c.len() {
        11 => vec![split(NdcForm::Eleven542)],
        10 => [NdcForm::Ten442, NdcForm::Ten532, NdcForm::Ten541]
            .into_iter()
            .map(split)
            .collect(),
        _ => Vec::new(),
    }
}

pub(super) fn ndc_shape(c: &str) -> Shape {
    let r = ndc(c);
    match r.as_slice() {
        [] => fails("an NDC is 10 digits written 4-4-2, 5-3-2 or 5-4-1, or 11 digits (5-4-2)"),
        [one] => fits(
            one.eleven.clone(),
            format!("has an NDC shape ({}; 11-digit form {})", one.form.name(), one.eleven),
        ),
        many => Shape::Ambiguous {
            reason: format!(
                "{c} is a 10-digit NDC without hyphens, so its layout is unknown: it may be {}; write it with hyphens or in the 11-digit form",
                many.iter()
                    .map(|m| format!("{} ({})", m.eleven, m.form.name()))
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
            readings: many.iter().map(|m| m.eleven.clone()).collect(),
        },
    }
}

/// RxNorm concept identifiers (RXCUI): a positive number with no leading
/// zero (RxNorm technical documentation, RXNCONSO.RRF; from memory they
/// have at most seven digits so far; up to eight are accepted).
pub(super) fn rxnorm(c: &str) -> Shape {
    if all_digits(c) && c.len() <= 8 && !c.starts_with('0') {
        return fits(c, "has the RxNorm identifier shape (a number)");
    }
    fails("an RxNorm identifier (RXCUI) is a number such as 860975")
}
