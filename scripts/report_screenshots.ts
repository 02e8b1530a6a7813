// Screenshots of each HTML report kind on the demo, for the README
// (docs/reports/KIND.png, the top of each page at 760 px wide), taken by
// headless Chromium as the browser test opens them; prints each report's
// size and its page count printed to PDF.
//
// Run: deno run -A scripts/report_screenshots.ts
import { chromiumPath, openInChromium, pdfPages } from "../tests/e2e/_browser.ts";
import { paygrove, ROOT } from "../tests/e2e/_cli.ts";

const chromium = await chromiumPath();
if (chromium === null) throw new Error("needs chromium (apt-get install chromium)");
const dir = await Deno.makeTempDir({ prefix: "paygrove-shots-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const model = `${dir}/demo.model.json`;
const must = async (args: string[]) => {
  const run = await paygrove(args);
  if (run.code !== 0) throw new Error(`${args.join(" ")}: ${run.stderr}`);
};
await must(["fit", demo, "--target", "base_pay_eur", "--currency", "EUR", "--out", model]);
const profile = ["--set", "level=G4", "--set", "job_family=Sales"];
const kinds: [string, string[]][] = [
  ["fit", ["fit", demo, "--target", "base_pay_eur", "--currency", "EUR", "--out", `${dir}/f.json`]],
  ["estimate", ["estimate", model, ...profile, "--offer", "70k"]],
  ["compare", ["compare", model, ...profile, "--change", "level=+1"]],
  ["sweep", ["sweep", model, ...profile, "--vary", "years_experience"]],
  ["bands", ["bands", model, "--table", demo]],
  ["gap", ["gap", demo, "--target", "base_pay_eur", "--group", "gender", "--within", "level"]],
  ["review", ["review", demo, "--target", "base_pay_eur", "--within", "level"]],
];
await Deno.mkdir(`${ROOT}docs/reports`, { recursive: true });
for (const [kind, args] of kinds) {
  const report = `${dir}/${kind}.html`;
  await must([...args, "--report", report]);
  const shot = await openInChromium(chromium, report, "screenshot", "760,1300");
  await Deno.writeFile(`${ROOT}docs/reports/${kind}.png`, shot.output);
  const pdf = await openInChromium(chromium, report, "pdf");
  const size = (await Deno.stat(report)).size;
  console.log(`${kind}: ${(size / 1024).toFixed(0)} KB, ${pdfPages(pdf.output)} pages printed`);
}
// The guided flow's saved session: two scenarios and a promotion.
{
  const { applyChanges, compareAnswer, estimateProfile, openModel, readModelFile, typicalProfile } =
    await import("../mod.ts");
  const { writeReport } = await import("../tui/flow/save_step.ts");
  const { makeStyle } = await import("../tui/render/style.ts");
  const read = await readModelFile(model);
  const session = openModel(read);
  const typical = typicalProfile(read);
  const promoted = applyChanges(read, typical, ["level=+1"]).profile;
  const report = `${dir}/session.html`;
  await writeReport(
    { say: () => {}, style: makeStyle(false) } as never,
    read,
    [
      { name: "typical", answer: estimateProfile(session, typical) },
      { name: "promoted", answer: estimateProfile(session, promoted) },
    ],
    [compareAnswer(session, typical, promoted)],
    report,
    null,
    null,
    false,
  );
  const shot = await openInChromium(chromium, report, "screenshot", "760,1300");
  await Deno.writeFile(`${ROOT}docs/reports/session.png`, shot.output);
  const pdf = await openInChromium(chromium, report, "pdf");
  const size = (await Deno.stat(report)).size;
  console.log(`session: ${(size / 1024).toFixed(0)} KB, ${pdfPages(pdf.output)} pages printed`);
}
await Deno.remove(dir, { recursive: true });
