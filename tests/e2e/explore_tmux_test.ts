// `paygrove explore` in a real pseudo-terminal (tmux, 80 x 24): a
// promotion, a site change and an undo, read off the screen; q leaves the
// alternate screen with the summary on the normal one, Ctrl-C with 130,
// the screen given back each time.
import assert from "node:assert/strict";
import { paygrove, ROOT, taskArgs } from "./_cli.ts";

const HAS_TMUX = await new Deno.Command("tmux", { args: ["-V"], stdout: "null", stderr: "null" })
  .output().then((o) => o.success, () => false);
const IN_CI = Deno.env.get("CI") === "true";

// Each run on a server of its own (-L): a new session never meets a server
// that is still shutting down after the last one's session ended.
let socket = "";
async function tmux(...args: string[]): Promise<string> {
  const out = await new Deno.Command("tmux", {
    args: ["-L", socket, ...args],
    stdout: "piped",
    stderr: "piped",
  }).output();
  if (!out.success) {
    throw new Error(`tmux ${args.join(" ")}: ${new TextDecoder().decode(out.stderr)}`);
  }
  return new TextDecoder().decode(out.stdout);
}

Deno.test({
  name:
    "tmux: explore walks a promotion, a site change and an undo; q and Ctrl-C restore the screen",
  ignore: !HAS_TMUX && !IN_CI,
  fn: async () => {
    assert.ok(HAS_TMUX, "tmux is missing: .ci/run installs it");
    const dir = await Deno.makeTempDir();
    const model = `${dir}/m.json`;
    const fit = await paygrove([
      "fit",
      `${ROOT}fixtures/demo_company.csv`,
      "--target",
      "base_pay_eur",
      "--trees",
      "30",
      "--out",
      model,
    ]);
    assert.equal(fit.code, 0, fit.stderr);
    const run = async (keys: string[][]): Promise<{ screens: string[]; end: string }> => {
      const session = `paygrove-ex-${crypto.randomUUID().slice(0, 8)}`;
      socket = session;
      const command = [
        Deno.execPath(),
        ...taskArgs("paygrove"),
        "explore",
        model,
        "--set",
        "level=G2",
      ]
        .map((w) => `'${w}'`).join(" ");
      await tmux(
        "new-session",
        "-d",
        "-s",
        session,
        "-x",
        "80",
        "-y",
        "24",
        "-c",
        ROOT,
        `NO_COLOR=1 ${command}; echo "status=$?"; sleep 30`,
      );
      const screen = () => tmux("capture-pane", "-p", "-t", session);
      const when = async (test: (s: string) => boolean) => {
        const deadline = performance.now() + 60_000;
        for (;;) {
          const now = await screen();
          if (test(now)) return now;
          if (performance.now() > deadline) throw new Error(`the screen shows:\n${now}`);
          await new Promise((resolve) => setTimeout(resolve, 100));
        }
      };
      try {
        const screens = [await when((s) => s.includes("Estimate "))];
        for (const step of keys) {
          const before = await screen();
          for (const key of step) await tmux("send-keys", "-t", session, key);
          screens.push(await when((s) => s !== before));
          await new Promise((resolve) => setTimeout(resolve, 300));
          screens[screens.length - 1] = await screen();
        }
        return { screens, end: await when((s) => /status=\d+/.test(s)) };
      } finally {
        await tmux("kill-server").catch(() => {});
      }
    };
    const walk = await run([["Down", "Right"], ["Down", "Down", "Down", "Right"], ["u"], ["q"]]);
    const [first, promoted, moved, undone] = walk.screens;
    assert.match(first, /> job_family/);
    assert.match(promoted, /> level\s+G3 \*/);
    assert.match(promoted, /Change\s+\+[\d,]+ \(\+[\d.]+%\)/);
    assert.match(moved, /> site\s+\S+.*\*/);
    assert.doesNotMatch(undone, /> site\s+\S+ \*/);
    const estimate = (s: string) => /Estimate ([\d,]+)/.exec(s)![1];
    assert.equal(estimate(undone), estimate(promoted));
    // Every screen within 80 x 24.
    for (const s of walk.screens) {
      assert(s.split("\n").every((l) => l.length <= 80));
    }
    assert.match(walk.end, /Ended at: [\d,]+ \(\+[\d.]+% from the start\), level G2 -> G3/);
    assert.match(walk.end, /status=0/);
    assert.doesNotMatch(walk.end, /> job_family/, "the alternate screen is gone");
    const stopped = await run([["Down", "Right"], ["C-c"]]);
    assert.match(stopped.end, /status=130/);
    await Deno.remove(dir, { recursive: true });
  },
});
