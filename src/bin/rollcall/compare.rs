//! `rollcall compare`: two lists and the billable codes they reach.

use super::*;

pub(crate) fn run(a: &Args, format: &str) -> Result<ExitCode, String> {
    let target = target(a)?;
    let opts = options(a, default_day(&target, a)).map_err(|Usage(m)| m)?;
    let [fa, fb] = a.files.as_slice() else {
        return Err(format!(
            "compare needs two lists, A and B (got {}); - reads one of them from standard input",
            a.files.len()
        ));
    };
    if fa == "-" && fb == "-" {
        return Err("only one of the two lists can come from standard input".into());
    }
    let (ta, tb) = (read_list(fa)?, read_list(fb)?);
    let c = match target {
        Target::Index(l) => {
            let i = l.index();
            rollcall::compare::compare_among(i, &companions(i)?, (fa, &ta), (fb, &tb), &opts)
        }
        Target::Shapes(s) => {
            return Err(format!(
                "compare needs the content of the system; rollcall has no {} index (bundled: icd10cm, icd10pcs)",
                s.title()
            ))
        }
    };
    write_as(format, &c, render::comparison_csv, render::comparison_text);
    let clean = c.same_codes() && !c.a.report.has_errors() && !c.b.report.has_errors();
    Ok(if clean {
        ExitCode::SUCCESS
    } else {
        ExitCode::from(1)
    })
}
