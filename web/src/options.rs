//! The check options the page sends (`{ on, from, to, billable, reading }`)
//! read into the core's: the texts parsed as days, blanks taken as not
//! given, and the day or the period chosen by the core's rule
//! ([`CheckOptions::asked`]), as the CLI chooses it.

use crate::js::{fail, JsCheckOptions};
use rollcall::list::Reading;
use rollcall::{CheckOptions, Date};
use serde::Deserialize;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

/// Check options as the page sends them.
#[derive(Deserialize, Default, Debug)]
#[serde(deny_unknown_fields)]
struct OptionsInput {
    #[serde(default)]
    on: Option<String>,
    #[serde(default)]
    from: Option<String>,
    #[serde(default)]
    to: Option<String>,
    #[serde(default)]
    billable: bool,
    #[serde(default)]
    reading: Option<String>,
}

/// The reading the page asked for (`auto` when none).
fn reading_of(input: &OptionsInput) -> Result<Reading, String> {
    match input.reading.as_deref().map(str::trim) {
        None | Some("") => Ok(Reading::Auto),
        Some(name) => Reading::parse(name).ok_or_else(|| {
            format!(
                "\u{201c}{name}\u{201d} is not a way to read a list (known: auto, {})",
                Reading::FORCED.map(|r| r.name()).join(", ")
            )
        }),
    }
}

/// A day the page gave, parsed; `what` names its field in the message.
fn parse_day(what: &str, text: &str) -> Result<Date, String> {
    Date::parse(text.trim())
        .map_err(|e| format!("{what} \u{201c}{text}\u{201d} is not a date: {e}"))
}

/// The day in a field, when the field is given (not blank).
fn day_in(what: &str, value: &Option<String>) -> Result<Option<Date>, String> {
    match value.as_deref() {
        Some(text) if !text.trim().is_empty() => parse_day(what, text).map(Some),
        _ => Ok(None),
    }
}

/// Turn the page's options into core options the way the CLI does: a single
/// day, or a study period with both ends, or (nothing given) `default_day`
/// (the index's default day: today when the index covers it).
fn resolve_options(input: &OptionsInput, default_day: Date) -> Result<CheckOptions, String> {
    let on = day_in("date", &input.on)?;
    let from = day_in("study period start", &input.from)?;
    let to = day_in("study period end", &input.to)?;
    CheckOptions::asked(on, from, to, input.billable, default_day).map_err(|e| e.to_string())
}

/// The reading a request names (`auto` when none), as a JS `Error` under
/// `context` when it names none the core knows.
pub(crate) fn reading_named(reading: Option<String>, context: &str) -> Result<Reading, JsValue> {
    reading_of(&OptionsInput {
        reading,
        ..OptionsInput::default()
    })
    .map_err(|e| fail(context, e))
}

/// The options and the reading the page sends; with no day or period,
/// `default_day`.
pub(crate) fn read_options(
    options: JsCheckOptions,
    default_day: Date,
) -> Result<(CheckOptions, Reading), JsValue> {
    let options: JsValue = options.into();
    let input: OptionsInput = if options.is_undefined() || options.is_null() {
        OptionsInput::default()
    } else {
        // serde-wasm-bindgen reads only the fields it knows; name any other.
        if options.is_object() {
            let object: &js_sys::Object = options.unchecked_ref();
            for key in js_sys::Object::keys(object).iter() {
                let key = key.as_string().unwrap_or_default();
                if !matches!(key.as_str(), "on" | "from" | "to" | "billable" | "reading") {
                    return Err(fail(
                        "bad check options",
                        format!("unknown option \u{201c}{key}\u{201d} (known: on, from, to, billable, reading)"),
                    ));
                }
            }
        }
        serde_wasm_bindgen::from_value(options).map_err(|e| fail("bad check options", e))?
    };
    let reading = reading_of(&input).map_err(|e| fail("bad check options", e))?;
    let opts = resolve_options(&input, default_day).map_err(|e| fail("bad check options", e))?;
    Ok((opts, reading))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn day(s: &str) -> Date {
        Date::parse(s).unwrap()
    }

    #[test]
    fn options_resolve_like_the_cli() {
        let today = day("2025-03-04");
        let none = resolve_options(&OptionsInput::default(), today).unwrap();
        assert_eq!((none.from, none.to, none.billable), (today, today, false));

        let on = OptionsInput {
            on: Some("2020-01-01".into()),
            ..Default::default()
        };
        let o = resolve_options(&on, today).unwrap();
        assert_eq!((o.from, o.to), (day("2020-01-01"), day("2020-01-01")));

        let period = OptionsInput {
            from: Some("2019-01-01".into()),
            to: Some("2020-12-31".into()),
            billable: true,
            ..Default::default()
        };
        let p = resolve_options(&period, today).unwrap();
        assert_eq!(
            (p.from, p.to, p.billable),
            (day("2019-01-01"), day("2020-12-31"), true)
        );

        // Blank strings count as not given.
        let blanks = OptionsInput {
            on: Some(" ".into()),
            from: Some(String::new()),
            ..Default::default()
        };
        assert_eq!(resolve_options(&blanks, today).unwrap().from, today);
    }

    #[test]
    fn bad_options_give_messages() {
        let today = day("2025-03-04");
        let both = OptionsInput {
            on: Some("2020-01-01".into()),
            from: Some("2019-01-01".into()),
            ..Default::default()
        };
        assert!(resolve_options(&both, today)
            .unwrap_err()
            .contains("not both"));
        let bad = OptionsInput {
            on: Some("2020-13-01".into()),
            ..Default::default()
        };
        assert!(resolve_options(&bad, today)
            .unwrap_err()
            .contains("not a date"));
        let backwards = OptionsInput {
            from: Some("2021-01-01".into()),
            to: Some("2020-01-01".into()),
            ..Default::default()
        };
        assert!(resolve_options(&backwards, today)
            .unwrap_err()
            .contains("after it ends"));
        let half = OptionsInput {
            from: Some("2021-01-01".into()),
            ..Default::default()
        };
        assert!(resolve_options(&half, today)
            .unwrap_err()
            .contains("both a start and an end"));
    }
}
