/**
 * A real browser for the HTML report tests: Debian's Chromium, headless, as
 * a subprocess (the test task denies Deno the network, so there is no
 * driver over a debugging socket). What it can tell: its screenshot, its
 * PDF, the console messages it logged, and the requests the page made (from
 * its network log).
 *
 * @module
 */

import { Buffer } from "node:buffer";
import pngjs from "pngjs";

/** Where Chromium is, or null. */
export async function chromiumPath(): Promise<string | null> {
  for (const path of ["/usr/bin/chromium", "/usr/bin/chromium-browser", "/usr/bin/google-chrome"]) {
    try {
      if ((await Deno.stat(path)).isFile) return path;
    } catch {
      // Not here.
    }
  }
  return null;
}

/** What one headless run left behind. */
export interface BrowserRun {
  /** Console messages of the page ("CONSOLE" lines of Chromium's log). */
  console: string[];
  /** Requests the page itself started (not Chromium's own), other than file: and data:. */
  requests: string[];
  /** The output file's bytes (the screenshot or the PDF). */
  output: Uint8Array;
}

// Chromium's own background traffic (updates, accounts, spelling) is kept
// down; what is left of it is told from the page's by its initiator.
const QUIET = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--disable-extensions",
  "--disable-default-apps",
  "--no-first-run",
  "--no-default-browser-check",
  "--hide-scrollbars",
  "--enable-logging=stderr",
  "--v=0",
];

/**
 * Opens `file` in headless Chromium and takes a screenshot (`kind:
 * "screenshot"`, at `size` "WIDTH,HEIGHT") or prints it (`kind: "pdf"`).
 */
export async function openInChromium(
  chromium: string,
  file: string,
  kind: "screenshot" | "pdf",
  size = "760,1200",
): Promise<BrowserRun> {
  const work = await Deno.makeTempDir({ prefix: "paygrove-chromium-" });
  const output = `${work}/out.${kind === "pdf" ? "pdf" : "png"}`;
  const netLog = `${work}/net.json`;
  try {
    const result = await new Deno.Command(chromium, {
      args: [
        ...QUIET,
        `--user-data-dir=${work}/profile`,
        `--log-net-log=${netLog}`,
        ...(kind === "pdf"
          ? [`--print-to-pdf=${output}`, "--no-pdf-header-footer"]
          : [`--screenshot=${output}`, `--window-size=${size}`]),
        `file://${file}`,
      ],
      stdout: "piped",
      stderr: "piped",
    }).output();
    const log = new TextDecoder().decode(result.stderr);
    let bytes: Uint8Array;
    try {
      bytes = await Deno.readFile(output);
    } catch {
      throw new Error(`chromium wrote no ${kind} (status ${result.code}):\n${log.slice(-2000)}`);
    }
    return {
      console: log.split("\n").filter((l) => /:CONSOLE[:(]/.test(l)),
      requests: pageRequests(JSON.parse(await Deno.readTextFile(netLog))),
      output: bytes,
    };
  } finally {
    await Deno.remove(work, { recursive: true }).catch(() => {});
  }
}

// deno-lint-ignore no-explicit-any
function pageRequests(log: any): string[] {
  const types: Record<number, string> = Object.fromEntries(
    Object.entries(log.constants.logEventTypes as Record<string, number>).map(([k, v]) => [v, k]),
  );
  const out: string[] = [];
  for (const event of log.events) {
    if (types[event.type] !== "URL_REQUEST_START_JOB") continue;
    // The job's end has no parameters; its start names the URL.
    const url: string | undefined = event.params?.url;
    if (url === undefined) continue;
    // A page's requests carry its origin ("null" for a file); Chromium's own, none.
    if (event.params?.initiator === "not an origin") continue;
    if (/^(?:file|data):/.test(url)) continue;
    out.push(url);
  }
  return out;
}

/**
 * The share of pixels in each box of a PNG that are not the white page:
 * ink drawn there.
 */
export function inkInBoxes(
  png: Uint8Array,
  boxes: { x: number; y: number; width: number; height: number }[],
): number[] {
  // pngjs reads a Node Buffer.
  const image = pngjs.PNG.sync.read(Buffer.from(png));
  return boxes.map((box) => {
    let ink = 0;
    let all = 0;
    for (let y = box.y; y < Math.min(image.height, box.y + box.height); y++) {
      for (let x = box.x; x < Math.min(image.width, box.x + box.width); x++) {
        const i = 4 * (y * image.width + x);
        all++;
        if (image.data[i] < 235 || image.data[i + 1] < 235 || image.data[i + 2] < 235) ink++;
      }
    }
    return all === 0 ? 0 : ink / all;
  });
}

/** Pages of a PDF Chromium printed (its page objects). */
export function pdfPages(pdf: Uint8Array): number {
  const text = new TextDecoder("latin1").decode(pdf);
  return [...text.matchAll(/\/Type\s*\/Page(?!s)/g)].length;
}
