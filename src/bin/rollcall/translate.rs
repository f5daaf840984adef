//! `rollcall translate`: a list carried through the GEMs.

use super::*;

pub(crate) fn run(a: &Args, format: &str) -> Result<ExitCode, String> {
    let [file] = a.files.as_slice() else {
        return Err("translate needs one list: a FILE, or - for standard input".into());
    };
    let text = read_list(file)?;
    let cm = Index::open(BUNDLED).map_err(|e| e.to_string())?;
    // Targets are judged for the period: the default day is the target index's.
    let day = match a.into.as_deref() {
        Some("icd9cm") => icd9()?.meta().default_day(today()),
        _ => cm.meta().default_day(today()),
    };
    let opts = options(a, day).map_err(|Usage(m)| m)?;
    let t = match a.into.as_deref() {
        Some("icd10cm") => rollcall::translate::translate(icd9()?, &cm, &text, &opts)?,
        Some("icd9cm") => rollcall::translate::translate(&cm, icd9()?, &text, &opts)?,
        Some(other) => {
            return Err(format!(
                "translate --into {other}: the bundled mappings go to icd10cm (from ICD-9-CM) or to icd9cm (from ICD-10-CM)"
            ))
        }
        None => return Err("translate needs --into icd10cm or --into icd9cm".into()),
    };
    write_as(
        format,
        &t,
        render::translation_csv,
        render::translation_text,
    );
    Ok(ExitCode::SUCCESS)
}
