import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";

import { db } from "~/.server/db/client";
import { mailOutbox } from "~/.server/db/schema";
import { deliverDueMail } from "~/.server/mail/outbox";
import * as forgotPage from "~/routes/forgot-password";
import * as resetPage from "~/routes/reset-password";
import { createCompany, createMember, FIXTURE_PASSWORD, type FixtureMember, signIn } from "../fixtures/company";
import { linkIn, mailSinkPerFile, mailTo } from "../fixtures/mail-sink";
import { formData } from "../fixtures/forms";
import { callRoute } from "../fixtures/route-call";
import { fromSocket } from "../fixtures/client-address";

const sink = mailSinkPerFile(2602);
let member: FixtureMember;

beforeAll(async () => {
  member = await createMember(await createCompany("Reset company"), "technician");
});

/** Each test asks from its own documentation-range address, so their rate limits stay apart. */
function askForLink(email: string, clientAddress: string) {
  return callRoute(
    forgotPage.action,
    new Request("http://localhost:3000/forgot-password", { method: "POST", body: formData({ email }) }),
    {},
    fromSocket(clientAddress),
  );
}

function submitNewPassword(token: string, password: string) {
  return callRoute(
    resetPage.action,
    new Request(`http://localhost:3000/reset-password?token=${token}`, {
      method: "POST",
      body: formData({ token, password, confirm: password }),
    }),
  );
}

describe("password reset by e-mail", () => {
  it("round trip: ask, mail arrives, link sets the new password once, the old one stops working", async () => {
    const asked = await askForLink(member.email, "198.51.100.10");
    expect(asked).toMatchObject({ status: 200, body: { sent: true } });
    await deliverDueMail();

    const [mail, ...more] = await mailTo(sink, member.email);
    expect(more).toHaveLength(0);
    expect(mail!.subject).toBe("Choose a new Patina password");
    const link = linkIn(mail!, "/reset-password?token=");
    expect(link.origin).toBe("http://localhost:3000");
    const token = link.searchParams.get("token")!;

    const page = await callRoute(resetPage.loader, new Request(link));
    expect(page.body).toEqual({ token });

    const done = await submitNewPassword(token, "a-brand-new-password-7");
    expect(done).toMatchObject({ status: 200, body: { done: true } });
    await expect(signIn(member.email, "a-brand-new-password-7")).resolves.toContain("=");
    await expect(signIn(member.email, FIXTURE_PASSWORD)).rejects.toThrow(/sign-in failed/);

    const reused = await submitNewPassword(token, "yet-another-password-8");
    expect(reused.status).toBe(410);
    await expect(signIn(member.email, "yet-another-password-8")).rejects.toThrow(/sign-in failed/);
  });

  it("an unknown address gets the same answer and no mail", async () => {
    const unknown = `nobody-${Date.now()}@fixture.example`;
    const asked = await askForLink(unknown, "198.51.100.20");
    expect(asked).toMatchObject({ status: 200, body: { sent: true } });
    expect(await db().select().from(mailOutbox).where(eq(mailOutbox.recipient, unknown))).toHaveLength(0);
  });

  it("bad input names the field; a bad token is refused", async () => {
    const bad = await askForLink("not-an-address", "198.51.100.30");
    expect(bad.status).toBe(400);
    expect(bad.body).toMatchObject({ fieldErrors: { email: expect.any(String) } });
    const wrongToken = await submitNewPassword("no-such-token-000000000", "some-long-password-9");
    expect(wrongToken.status).toBe(410);
  });

  it("is rate-limited: five requests from one address in 15 minutes, the sixth is refused", async () => {
    const address = "198.51.100.40";
    const statuses: number[] = [];
    for (let i = 0; i < 6; i++) statuses.push((await askForLink(member.email, address)).status);
    expect(statuses).toEqual([200, 200, 200, 200, 200, 429]);
    // Another address is not held back by the first one's limit.
    expect((await askForLink(member.email, "198.51.100.41")).status).toBe(200);
  });
});
