// Run by tests/e2e/safe_files_test.ts: listens for the stop signals as a
// command does, says "busy", holds the thread for 3 s of synchronous work
// (as a long fold of a fit does) and then ends as a command ends.
import { listenForStop } from "../../tui/stop_signals.ts";

const stopListening = listenForStop((name) => console.error(`stopped (${name})`));
console.error("busy");
const until = Date.now() + 3000;
while (Date.now() < until) {
  // The signal arrives here and waits for the event loop.
}
await stopListening();
console.error("ended normally");
