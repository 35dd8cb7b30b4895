import { like, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { closeDatabase, db } from "~/.server/db/client";
import { authThrottle, mailOutbox } from "~/.server/db/schema";
import { clientAddress } from "~/.server/security/client-address";
import { THROTTLE_RULES } from "~/.server/security/throttle";
import * as forgotPage from "~/routes/forgot-password";
import * as signInPage from "~/routes/sign-in";
import { fromSocket } from "../fixtures/client-address";
import {
  createCompany,
  createMember,
  FIXTURE_PASSWORD,
  type FixtureMember,
} from "../fixtures/company";
import { postFormFrom } from "../fixtures/forms";
import type { Outcome } from "../fixtures/route-call";

let companyId: number;

beforeAll(async () => {
  companyId = await createCompany("Throttle company");
});

afterAll(closeDatabase);

const signInFrom = (socket: string, email: string, password: string, forwardedFor?: string) =>
  postFormFrom(socket, signInPage.action, "/sign-in", { email, password, next: "/" }, forwardedFor);

const askForLinkFrom = (socket: string, email: string, forwardedFor?: string) =>
  postFormFrom(socket, forgotPage.action, "/forgot-password", { email }, forwardedFor);

const formError = (outcome: Outcome) =>
  (outcome.body as { formError: string | null }).formError;

describe("sign-in throttling", () => {
  const accountMax = THROTTLE_RULES["sign-in"].account.max; // 5 failures per 15 minutes

  it("refuses the attempt after the account's limit, whatever X-Forwarded-For says, and says when to retry", async () => {
    const member = await createMember(companyId, "manager");
    const statuses: number[] = [];
    for (let i = 0; i < accountMax; i++) {
      statuses.push(
        (
          await signInFrom(
            "192.0.2.10",
            member.email,
            "wrong-password",
            `203.0.113.${i + 1}`,
          )
        ).status,
      );
    }
    expect(statuses).toEqual(Array(accountMax).fill(401));

    // The next one is refused, from a rotated forwarded address and even with the right password.
    const locked = await signInFrom(
      "192.0.2.10",
      member.email,
      FIXTURE_PASSWORD,
      "203.0.113.250",
    );
    expect(locked.status).toBe(429);
    expect(formError(locked)).toMatch(
      /Too many failed sign-ins.*Try again in 15 minutes \(at \d\d:\d\d UTC\)\./,
    );
    // Another socket address does not free the account either.
    expect(
      (await signInFrom("192.0.2.99", member.email, FIXTURE_PASSWORD)).status,
    ).toBe(429);
  });

  it("another account on the same address still signs in", async () => {
    const first = await createMember(companyId, "analyst");
    const second = await createMember(companyId, "analyst");
    for (let i = 0; i <= accountMax; i++)
      await signInFrom("192.0.2.20", first.email, "wrong-password");
    expect(
      (await signInFrom("192.0.2.20", first.email, FIXTURE_PASSWORD)).status,
    ).toBe(429);
    const other = await signInFrom(
      "192.0.2.20",
      second.email,
      FIXTURE_PASSWORD,
    );
    expect(other.status).toBe(302);
    expect(other.location).toBe("/");
  });

  it("an address is refused after its own limit, across accounts", async () => {
    const addressMax = THROTTLE_RULES["sign-in"].address.max; // 30 failures per 15 minutes
    const members: FixtureMember[] = [];
    // Spread the failures over accounts so no account reaches its own limit: 30 = 8 x 4 - 2.
    for (let i = 0; i < Math.ceil(addressMax / (accountMax - 1)); i++)
      members.push(await createMember(companyId, "technician"));
    let failures = 0;
    for (const member of members) {
      for (
        let i = 0;
        i < accountMax - 1 && failures < addressMax;
        i++, failures++
      ) {
        expect(
          (await signInFrom("192.0.2.30", member.email, "wrong-password"))
            .status,
        ).toBe(401);
      }
    }
    expect(failures).toBe(addressMax);
    const fresh = await createMember(companyId, "technician");
    expect(
      (await signInFrom("192.0.2.30", fresh.email, FIXTURE_PASSWORD)).status,
    ).toBe(429);
    // The same account from another address is fine.
    expect(
      (await signInFrom("192.0.2.31", fresh.email, FIXTURE_PASSWORD)).status,
    ).toBe(302);
  });

  it("a correct password clears the account's failures; a passed window starts afresh", async () => {
    const member = await createMember(companyId, "owner");
    for (let i = 0; i < accountMax - 1; i++)
      await signInFrom("192.0.2.40", member.email, "wrong-password");
    expect(
      (await signInFrom("192.0.2.40", member.email, FIXTURE_PASSWORD)).status,
    ).toBe(302);
    for (let i = 0; i < accountMax - 1; i++)
      await signInFrom("192.0.2.41", member.email, "wrong-password");
    expect(
      (await signInFrom("192.0.2.41", member.email, "wrong-password")).status,
    ).toBe(401); // the 5th failure of a new count
    expect(
      (await signInFrom("192.0.2.41", member.email, FIXTURE_PASSWORD)).status,
    ).toBe(429);

    // Fifteen minutes later (the window's end moved into the past): accepted again.
    await db()
      .update(authThrottle)
      .set({ windowEndsAt: sql`UTC_TIMESTAMP(3) - INTERVAL 1 SECOND` })
      .where(like(authThrottle.bucket, `sign-in:%`));
    expect(
      (await signInFrom("192.0.2.41", member.email, FIXTURE_PASSWORD)).status,
    ).toBe(302);
  });

  it("counts are kept in the database, per account and per address", async () => {
    const member = await createMember(companyId, "manager");
    await signInFrom("192.0.2.50", member.email, "wrong-password");
    const rows = await db()
      .select({ bucket: authThrottle.bucket, attempts: authThrottle.attempts })
      .from(authThrottle)
      .where(
        sql`${authThrottle.bucket} IN (${`sign-in:account:${member.email}`}, ${"sign-in:address:192.0.2.50"})`,
      );
    expect(rows.sort((a, b) => a.bucket.localeCompare(b.bucket))).toEqual([
      { bucket: `sign-in:account:${member.email}`, attempts: 1 },
      { bucket: "sign-in:address:192.0.2.50", attempts: 1 },
    ]);
  });
});

describe("password-reset throttling", () => {
  it("per address, whatever X-Forwarded-For says", async () => {
    const addressMax = THROTTLE_RULES.reset.address.max; // 5 per 15 minutes
    const statuses: number[] = [];
    for (let i = 0; i <= addressMax; i++) {
      statuses.push(
        (
          await askForLinkFrom(
            "192.0.2.60",
            `nobody-${i}-${Date.now()}@fixture.example`,
            `203.0.113.${i}`,
          )
        ).status,
      );
    }
    expect(statuses).toEqual([...Array(addressMax).fill(200), 429]);
  });

  it("per account, from any address, and no more mail once refused", async () => {
    const member = await createMember(companyId, "technician");
    const accountMax = THROTTLE_RULES.reset.account.max; // 8 per hour
    const statuses: number[] = [];
    for (let i = 0; i <= accountMax; i++)
      statuses.push(
        (await askForLinkFrom(`192.0.2.${100 + i}`, member.email)).status,
      );
    expect(statuses).toEqual([...Array(accountMax).fill(200), 429]);
    const refused = await askForLinkFrom("192.0.2.200", member.email);
    expect(formError(refused)).toMatch(/Try again in \d+ minutes?/);
    const mails = await db()
      .select()
      .from(mailOutbox)
      .where(sql`${mailOutbox.recipient} = ${member.email}`);
    expect(mails).toHaveLength(accountMax);
  });
});

describe("the client address", () => {
  const request = (forwardedFor?: string) =>
    new Request("http://localhost/", {
      headers: forwardedFor ? { "X-Forwarded-For": forwardedFor } : {},
    });

  it("is the socket's unless trusted proxies are configured", () => {
    expect(
      clientAddress(request("203.0.113.7"), fromSocket("192.0.2.1"), 0),
    ).toBe("192.0.2.1");
    expect(clientAddress(request(), fromSocket("192.0.2.1"), 1)).toBe(
      "192.0.2.1",
    );
  });

  it("with n trusted proxies, is the entry the outermost one appended; the client's own entries are ignored", () => {
    // client wrote "6.6.6.6", proxy 1 appended the real client, proxy 2 appended proxy 1.
    expect(
      clientAddress(
        request("6.6.6.6, 198.51.100.9, 10.0.0.2"),
        fromSocket("10.0.0.3"),
        2,
      ),
    ).toBe("198.51.100.9");
    expect(
      clientAddress(
        request("6.6.6.6, 198.51.100.9"),
        fromSocket("10.0.0.2"),
        1,
      ),
    ).toBe("198.51.100.9");
  });
});
