//! `rollcall show`: a card per code.

use super::*;

pub(crate) fn run(a: &Args, format: &str) -> Result<ExitCode, String> {
    if a.files.is_empty() {
        return Err("show needs one or more codes, e.g. rollcall show E11.6".into());
    }
    let target = target(a)?;
    let opts = options(a, default_day(&target, a)).map_err(|Usage(m)| m)?;
    let codes: Vec<&str> = a.files.iter().map(String::as_str).collect();
    let cards = match target {
        Target::Index(mut l) => {
            add_notes(l.index_mut(), a.notes.as_deref())?;
            let i = l.index();
            rollcall::card::cards(i, &companions(i)?, &codes, &opts)
        }
        Target::Shapes(s) => {
            return Err(format!(
                "show needs the content of the system; rollcall has no {} index (bundled: icd10cm, icd10pcs, icd9cm, hpo)",
                s.title()
            ))
        }
    };
    let out = match format {
        "json" => serde_json::to_string_pretty(&cards).map_err(|e| e.to_string())? + "\n",
        _ => render::cards_text(&cards),
    };
    write_out(&out);
    let known = cards.cards.iter().all(|c| c.problem.is_none());
    Ok(if known {
        ExitCode::SUCCESS
    } else {
        ExitCode::from(1)
    })
}
