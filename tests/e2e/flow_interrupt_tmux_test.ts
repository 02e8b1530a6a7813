// Ctrl-C in the guided flow, in a real pseudo-terminal (tmux): at a
// question the prompt library sees the key itself (the terminal is in raw
// mode, so no signal is sent), and the flow once ended with status 0 there
// while every command ends with 130 on Ctrl-C. Now it is 130 everywhere.
import assert from "node:assert/strict";
import { ROOT } from "./_cli.ts";

const HAS_TMUX = await new Deno.Command("tmux", { args: ["-V"], stdout: "null", stderr: "null" })
  .output().then((o) => o.success, () => false);
const IN_CI = Deno.env.get("CI") === "true";

async function tmux(...args: string[]): Promise<string> {
  const out = await new Deno.Command("tmux", { args, stdout: "piped", stderr: "piped" }).output();
  if (!out.success) {
    throw new Error(`tmux ${args.join(" ")}: ${new TextDecoder().decode(out.stderr)}`);
  }
  return new TextDecoder().decode(out.stdout);
}

/** Runs the flow, waits for each text and sends its keys; returns the exit status shown. */
async function flowStatus(
  steps: [string, ...string[]][],
): Promise<{ status: number; screen: string }> {
  const session = `paygrove-int-${crypto.randomUUID().slice(0, 8)}`;
  await tmux(
    "new-session",
    "-d",
    "-s",
    session,
    "-x",
    "80",
    "-y",
    "40",
    "-c",
    ROOT,
    `NO_COLOR=1 ${Deno.execPath()} task start --trees 20; echo "status=$?"; sleep 30`,
  );
  const screen = () => tmux("capture-pane", "-p", "-J", "-S", "-400", "-t", session);
  const when = async (text: string | RegExp) => {
    const deadline = performance.now() + 90_000;
    for (;;) {
      const now = await screen();
      const found = typeof text === "string" ? now.includes(text) : text.test(now);
      if (found) return now;
      if (performance.now() > deadline) {
        throw new Error(`the screen never showed ${text}; it shows:\n${now.slice(-1500)}`);
      }
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
  };
  try {
    for (const [text, ...keys] of steps) {
      await when(text);
      for (const key of keys) await tmux("send-keys", "-t", session, key);
    }
    const shown = await when(/status=\d+/);
    return { status: Number(/status=(\d+)/.exec(shown)![1]), screen: shown };
  } finally {
    await tmux("kill-session", "-t", session).catch(() => {});
  }
}

Deno.test({
  name: "tmux: Ctrl-C at the flow's first question and at its menu ends with status 130",
  ignore: !HAS_TMUX && !IN_CI,
  fn: async () => {
    assert.ok(HAS_TMUX, "tmux is missing: .ci/run installs it");
    const first = await flowStatus([["What do you want to work with?", "C-c"]]);
    assert.equal(first.status, 130, first.screen);
    assert.match(first.screen, /Stopped\. Nothing more was written\./);
    const menu = await flowStatus([
      ["What do you want to work with?", "Enter"],
      ["Which column should paygrove estimate?", "Enter"],
      ["Which attributes may explain it?", "Enter"],
      ["Check for pay gaps between groups first?", "Enter"],
      ["Start the profile from", "Enter"],
      ["What next?", "C-c"],
    ]);
    assert.equal(menu.status, 130, menu.screen);
    // Quitting from the menu is still a success.
    const quit = await flowStatus([
      ["What do you want to work with?", "Enter"],
      ["Which column should paygrove estimate?", "Enter"],
      ["Which attributes may explain it?", "Enter"],
      ["Check for pay gaps between groups first?", "Enter"],
      ["Start the profile from", "Enter"],
      ["What next?", "Up", "Enter"],
    ]);
    assert.equal(quit.status, 0, quit.screen);
  },
});
