import assert from "node:assert/strict";
import { VERSION } from "../../lib/version.ts";

Deno.test("VERSION is deno.json's version", () => {
  const config = JSON.parse(Deno.readTextFileSync(new URL("../../deno.json", import.meta.url)));
  assert.equal(typeof config.version, "string");
  assert.equal(VERSION, config.version);
});

// The pattern is the core of semver.org's (2.0.0) regular expression for a
// version (from memory), without pre-release or build parts.
Deno.test("VERSION is a semantic version", () => {
  assert.match(VERSION, /^(0|[1-9]\d*)\.(0|[1-9]\d*)\.(0|[1-9]\d*)$/);
});
