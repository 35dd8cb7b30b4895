import { afterEach, expect } from "vitest";
import { takeCspViolations } from "../fixtures/browser";

// Every browser test runs under the production Content-Security-Policy; nothing it does may be blocked.
afterEach(() => {
  expect(takeCspViolations().join("\n"), "Content-Security-Policy violations").toBe("");
});
