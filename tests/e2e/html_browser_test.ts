// HTML reports opened in a real browser (Debian's Chromium, headless, as a
// subprocess): no console message and no request of the page's own; every
// chart drawn (ink inside each chart's fixed box, on a board of the
// report's charts with the report's own styles); printed to PDF within a
// stated page count. Outside CI a machine without Chromium skips, with a
// note; in CI (CI=true) that fails, so a missing install cannot pass.
import assert from "node:assert/strict";
import { chromiumPath, inkInBoxes, openInChromium, pdfPages } from "./_browser.ts";
import { fitDemoModel, paygrove, ROOT } from "./_cli.ts";

const chromium = await chromiumPath();
const inCi = Deno.env.get("CI") === "true";
const ignore = chromium === null && !inCi;
if (ignore) console.warn("html_browser_test: no chromium here; skipped (CI installs it)");

const dir = await Deno.makeTempDir({ prefix: "paygrove-browser-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const model = `${dir}/demo.model.json`;

// Fitted once, by whichever test needs it first.
let fitted = false;
async function fitDemo(): Promise<void> {
  if (fitted) return;
  fitted = true;
  await fitDemoModel(model);
}

// The report's charts alone, each at a known place: the page's head (its
// styles and its Content-Security-Policy), then each chart's box stacked
// down the left edge, 20 px apart.
function chartBoard(html: string): {
  html: string;
  boxes: { x: number; y: number; width: number; height: number }[];
} {
  const head = html.slice(0, html.indexOf("</head>") + "</head>".length);
  const boxes: { x: number; y: number; width: number; height: number }[] = [];
  const slots: string[] = [];
  let y = 0;
  for (
    const figure of html.matchAll(
      /<figure class="chart"[^>]*data-height="(\d+)"[^>]*>([^]*?)<\/figure>/g,
    )
  ) {
    const height = Number(figure[1]);
    const box = figure[2].slice(0, figure[2].indexOf("<figcaption>"));
    slots.push(`<div style="position:absolute;left:0;top:${y}px;width:640px">${box}</div>`);
    boxes.push({ x: 0, y, width: 640, height });
    y += height + 20;
  }
  return {
    html: `${head}<body style="margin:0;padding:0;max-width:none">${
      slots.join("\n")
    }</body></html>`,
    boxes,
  };
}

// Opens a report three ways and checks what a reader would see.
async function checkInBrowser(report: string, maxPages: number): Promise<number[]> {
  const html = await Deno.readTextFile(report);
  const page = await openInChromium(chromium!, report, "screenshot", "760,2400");
  assert.deepEqual(page.console, [], `console messages of ${report}`);
  assert.deepEqual(page.requests, [], `requests of ${report}`);
  const board = chartBoard(html);
  assert(board.boxes.length > 0, "the report has charts");
  const boardFile = report.replace(/\.html$/, ".board.html");
  await Deno.writeTextFile(boardFile, board.html);
  const last = board.boxes[board.boxes.length - 1];
  const shot = await openInChromium(
    chromium!,
    boardFile,
    "screenshot",
    `660,${last.y + last.height + 10}`,
  );
  assert.deepEqual(shot.console, []);
  const ink = inkInBoxes(shot.output, board.boxes);
  ink.forEach((share, i) => assert(share > 0.01, `chart ${i + 1} of ${report}: ${share} ink`));
  const pdf = await openInChromium(chromium!, report, "pdf");
  const pages = pdfPages(pdf.output);
  assert(pages >= 1 && pages <= maxPages, `${report}: ${pages} pages, at most ${maxPages}`);
  return ink;
}

Deno.test({
  name: "the browser checks catch what they are for: an outside image, an empty chart",
  ignore,
  async fn() {
    // A page with an outside image and a console message, without the CSP
    // guard: the network log and the console show both.
    const bad = `${dir}/bad.html`;
    await Deno.writeTextFile(
      bad,
      `<!DOCTYPE html><html><head><title>x</title></head><body>` +
        `<img src="http://paygrove-test.invalid/x.png"><p>x</p></body></html>`,
    );
    const run = await openInChromium(chromium!, bad, "screenshot", "400,300");
    assert.deepEqual(run.requests, ["http://paygrove-test.invalid/x.png"]);
    // An empty chart box has no ink; a drawn one has.
    const empty = `${dir}/empty.html`;
    await Deno.writeTextFile(
      empty,
      `<!DOCTYPE html><html><head></head><body style="margin:0">` +
        `<div style="position:absolute;top:0;width:640px;height:200px"><svg width="640" height="200"></svg></div>` +
        `<div style="position:absolute;top:220px;width:640px;height:200px"><svg width="640" height="200">` +
        `<rect x="10" y="10" width="300" height="100" fill="#0072B2"/></svg></div></body></html>`,
    );
    const shot = await openInChromium(chromium!, empty, "screenshot", "660,430");
    const [none, drawn] = inkInBoxes(shot.output, [
      { x: 0, y: 0, width: 640, height: 200 },
      { x: 0, y: 220, width: 640, height: 200 },
    ]);
    assert(none < 0.001, `empty box: ${none}`);
    assert(drawn > 0.2, `drawn box: ${drawn}`);
  },
});

Deno.test({
  name: "bands --report .html in Chromium: charts drawn, nothing fetched, at most 5 pages",
  ignore,
  async fn() {
    await fitDemo();
    const report = `${dir}/bands.html`;
    const run = await paygrove(["bands", model, "--table", demo, "--report", report]);
    assert.equal(run.code, 0, run.stderr);
    const ink = await checkInBrowser(report, 5);
    assert.equal(ink.length, 1);
  },
});

Deno.test({
  name: "every other report kind in Chromium: fit, estimate, compare, sweep, gap",
  ignore,
  async fn() {
    await fitDemo();
    const profile = ["--set", "level=G4", "--set", "job_family=Sales"];
    const runs: [string, string[], number][] = [
      ["fit", [
        "fit",
        demo,
        "--target",
        "base_pay_eur",
        "--trees",
        "20",
        "--folds",
        "3",
        "--out",
        `${dir}/f.model.json`,
      ], 4],
      ["estimate", ["estimate", model, ...profile, "--offer", "70k"], 6],
      ["compare", ["compare", model, ...profile, "--change", "level=+1"], 5],
      ["sweep", ["sweep", model, ...profile, "--vary", "years_experience"], 4],
      ["gap", [
        "gap",
        demo,
        "--target",
        "base_pay_eur",
        "--group",
        "gender",
        "--within",
        "level",
        "--trees",
        "20",
      ], 8],
    ];
    for (const [kind, args, maxPages] of runs) {
      const report = `${dir}/${kind}.html`;
      const run = await paygrove([...args, "--report", report]);
      assert.equal(run.code, 0, `${kind}: ${run.stderr}`);
      const ink = await checkInBrowser(report, maxPages);
      assert(ink.length >= 1, kind);
    }
  },
});

Deno.test({
  name: "the guided flow's session report in Chromium: scenarios side by side and a what-if",
  ignore,
  async fn() {
    const {
      applyChanges,
      compareAnswer,
      estimateProfile,
      openModel,
      readModelFile,
      typicalProfile,
    } = await import("../../mod.ts");
    const { writeReport } = await import("../../tui/flow/save_step.ts");
    const { makeStyle } = await import("../../tui/render/style.ts");
    await fitDemo();
    const read = await readModelFile(model);
    const session = openModel(read);
    const typical = typicalProfile(read);
    const promoted = applyChanges(read, typical, ["level=+1"]).profile;
    const scenarios = [
      { name: "typical", answer: estimateProfile(session, typical) },
      { name: "promoted", answer: estimateProfile(session, promoted) },
    ];
    const report = `${dir}/session.html`;
    const io = { say: () => {}, style: makeStyle(false) } as never;
    await writeReport(
      io,
      read,
      scenarios,
      [compareAnswer(session, typical, promoted)],
      report,
      null,
      null,
      false,
    );
    const ink = await checkInBrowser(report, 12);
    // The scenarios on one axis, then each scenario's and the what-if's charts.
    assert(ink.length >= 5, `${ink.length} charts`);
  },
});
