import { afterAll, describe, expect, it } from "vitest";
import { auth } from "~/.server/auth";
import { closeDatabase } from "~/.server/db/client";
import { headersFor } from "~/.server/security/headers";
import { createCompany, createMember, FIXTURE_PASSWORD } from "../fixtures/company";

// A server whose public URL is https. Imports are evaluated first, but no server
// module reads the environment until it is first used, below.
process.env.PATINA_URL = "https://patina.example";

afterAll(closeDatabase);

describe("when PATINA_URL is https", () => {
  it("the session cookie is Secure, and responses carry HSTS", async () => {
    const member = await createMember(await createCompany(), "analyst");
    const response = await auth().api.signInEmail({ body: { email: member.email, password: FIXTURE_PASSWORD }, asResponse: true });
    const cookies = response.headers.getSetCookie();
    expect(cookies.length).toBeGreaterThan(0);
    for (const cookie of cookies) expect(cookie).toMatch(/;\s*Secure/i);
    expect(headersFor("n")["Strict-Transport-Security"]).toBe("max-age=31536000; includeSubDomains");
  });
});
