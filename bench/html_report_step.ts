// The report step alone, in a fresh process, for the gap check (whose
// whole runs vary more than the step costs): the gap is computed first,
// then the HTML modules are loaded and the page built, as `gap --report
// FILE.html` does; the Markdown report's step beside it. Usage:
//   deno run -A bench/html_report_step.ts
import { gapCheck, loadTableFile } from "../mod.ts";

const table = await loadTableFile("fixtures/demo_company.csv", { target: "base_pay_eur" });
const report = await gapCheck(table, {
  target: "base_pay_eur",
  group: "gender",
  within: ["level"],
  workers: 2,
});
let t = performance.now();
const { gapMarkdown } = await import("../tui/render/gap_view.ts");
const markdown = gapMarkdown(report, {}, new Date().toISOString());
const markdownMs = performance.now() - t;
t = performance.now();
const { gapSections } = await import("../tui/render/html/gap_html.ts");
const { htmlPage } = await import("../tui/render/html/page.ts");
const loaded = performance.now() - t;
const html = htmlPage({
  title: "Pay gaps by gender",
  question: "q",
  created: new Date().toISOString(),
  provenance: [],
  cautions: [],
  sections: gapSections(report, [], {}),
});
const htmlMs = performance.now() - t;
console.log(
  `Markdown step ${markdownMs.toFixed(0)} ms (${markdown.length} characters); HTML step ` +
    `${htmlMs.toFixed(0)} ms, of which loading the modules ${loaded.toFixed(0)} ms ` +
    `(${html.length} characters)`,
);
