// The JavaScript API example of the README: open the bundled index, check
// rows of a list over a study period, show the report (the CLI's JSON).
import { open } from "./rollcall.js";

const status = document.getElementById("api-status");
try {
  const checker = await open("icd10cm.rcx", { manifest: "index-manifest.json" });
  const report = await checker.check(
    [
      { code: "E11.9", label: "Type 2 diabetes mellitus without complications" },
      { code: "E11", label: "Type 2 diabetes mellitus" },
      ["I1O", "Essential hypertension, mistyped"],
      "I50.2",
    ],
    { from: "2019-01-01", to: "2024-12-31", billable: true },
  );
  const s = report.summary;
  status.textContent = `Checked against ${checker.info.release}: ${s.errors} errors, ${s.warnings} warnings, ${s.infos} info.`;
  document.getElementById("api-report").textContent = JSON.stringify(report, null, 2);
  document.body.dataset.state = "done";
  checker.close();
} catch (e) {
  status.textContent = `The example failed: ${e.message}`;
  document.body.dataset.state = "failed";
}
