import { describe, expect, it } from "vitest";
import { contentSecurityPolicy, securityHeaders } from "./headers";
import { judgeOrigin } from "./origin-check";

describe("security headers", () => {
  it("send HSTS only when the public URL is https", () => {
    expect(securityHeaders({ nonce: "n", https: true, development: false })["Strict-Transport-Security"]).toBe(
      "max-age=31536000; includeSubDomains",
    );
    expect(securityHeaders({ nonce: "n", https: false, development: false })["Strict-Transport-Security"]).toBeUndefined();
  });

  it("carry the nonce in the policy, which allows no eval and no framing", () => {
    const policy = contentSecurityPolicy("abc123");
    expect(policy).toContain("script-src 'self' 'nonce-abc123'");
    expect(policy).not.toContain("unsafe-eval");
    expect(policy).toContain("frame-ancestors 'none'");
  });
});

describe("judgeOrigin", () => {
  const allowed = ["https://patina.example"];
  const post = (headers: Record<string, string>) => new Request("https://patina.example/x", { method: "POST", headers });

  it.each([
    [{ Origin: "https://patina.example" }, true],
    [{ Origin: "https://evil.example" }, false],
    [{ Origin: "http://patina.example" }, false],
    [{ Origin: "null" }, false],
    [{ "Sec-Fetch-Site": "same-origin" }, true],
    [{ "Sec-Fetch-Site": "same-site" }, false],
    [{ "Sec-Fetch-Site": "cross-site" }, false],
    [{}, true],
  ])("POST with %j: allowed %s", (headers, expected) => {
    expect(judgeOrigin(post(headers), allowed).allowed).toBe(expected);
  });

  it("never stops a GET", () => {
    expect(judgeOrigin(new Request("https://patina.example/x", { headers: { Origin: "https://evil.example" } }), allowed).allowed).toBe(true);
  });
});
