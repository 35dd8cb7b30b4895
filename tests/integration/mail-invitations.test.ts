import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";

import { db } from "~/.server/db/client";
import { invitations, mailOutbox, memberships, user } from "~/.server/db/schema";
import type { Scope } from "~/.server/scope";
import { inviteMember } from "~/.server/team/invitations";
import { deliverDueMail } from "~/.server/mail/outbox";
import * as invitePage from "~/routes/invite.$token";
import * as mailboxPage from "~/routes/mailbox";
import * as mailboxMessagePage from "~/routes/mailbox.$messageId";
import * as teamInvitations from "~/routes/team.invitations";
import * as teamPage from "~/routes/team";
import { createMember, type FixtureMember, requestAs } from "../fixtures/company";
import { linkIn, mailSinkPerFile, mailTo } from "../fixtures/mail-sink";
import { formData } from "../fixtures/forms";
import { routeBookPerFile } from "../fixtures/route-book";
import { callRoute, callRouteRaw, scopeFor } from "../fixtures/route-call";

const sink = mailSinkPerFile(2601);
const companyA = routeBookPerFile({ company: "Invitations A", members: { owner: "owner" } });
const companyB = routeBookPerFile({ company: "Invitations B", members: { owner: "owner" } });
const ownerA = companyA.member.owner;
const ownerB = companyB.member.owner;

async function invite(owner: FixtureMember, email: string, role: string) {
  return callRoute(
    teamInvitations.action,
    requestAs(owner, "/team/invitations", { method: "POST", body: formData({ intent: "invite", email, role }) }),
  );
}

/** Submits the invitation form and returns the raw response, whose cookies sign the new member in. */
async function accept(token: string, values: { name: string; password: string; confirm?: string }) {
  const request = new Request(`http://localhost:3000/invite/${token}`, {
    method: "POST",
    body: formData({ name: values.name, password: values.password, confirm: values.confirm ?? values.password }),
  });
  return callRoute(invitePage.action, request, { token });
}

async function acceptForCookie(token: string, values: { name: string; password: string }): Promise<Response> {
  const request = new Request(`http://localhost:3000/invite/${token}`, {
    method: "POST",
    body: formData({ ...values, confirm: values.password }),
  });
  const answer = await callRouteRaw(invitePage.action, request, { token });
  if (!(answer instanceof Response)) throw new Error(`expected a redirect, got ${JSON.stringify(answer)}`);
  return answer;
}

function tokenFromLink(url: URL): string {
  return url.pathname.split("/").at(-1)!;
}

describe("invitations by e-mail", () => {
  it("round trip: invite, mail arrives, link creates the account and signs in with the invited company and role", async () => {
    const email = `new-manager-${Date.now()}@fixture.example`;
    const sent = await invite(ownerA, email, "manager");
    expect(sent.status).toBe(200);

    const delivery = await deliverDueMail();
    expect(delivery.sent).toBeGreaterThanOrEqual(1);
    const [mail, ...more] = await mailTo(sink, email);
    expect(more).toHaveLength(0);
    expect(mail!.subject).toContain("Invitations A");
    expect(mail!.html).toContain("Accept the invitation");
    const link = linkIn(mail!, "/invite/");
    const token = tokenFromLink(link);

    // Only the hash of the token is stored: no column holds the token itself.
    const [row] = await db().select().from(invitations).where(eq(invitations.email, email));
    expect(row!.tokenHash).toBe(createHash("sha256").update(token).digest("hex"));
    expect(JSON.stringify(row)).not.toContain(token);

    const view = await callRoute(invitePage.loader, new Request(link), { token });
    expect(view.body).toMatchObject({ invitation: { state: "open", email, role: "manager", companyName: "Invitations A" } });

    const response = await acceptForCookie(token, { name: "Wren Tallis", password: "a-long-new-password-1" });
    expect(response.status).toBe(302);
    expect(response.headers.get("Location")).toBe("/");
    const cookie = response.headers
      .getSetCookie()
      .map((c) => c.split(";")[0])
      .join("; ");
    expect(cookie).not.toBe("");

    const scope: Scope = await scopeFor(
      new Request("http://localhost:3000/", { headers: { Cookie: cookie } }),
      "overview",
    );
    expect(scope).toMatchObject({ companyId: companyA.companyId, role: "manager", email, userName: "Wren Tallis" });

    const [created] = await db().select().from(user).where(eq(user.email, email));
    const joined = await db().select().from(memberships).where(eq(memberships.userId, created!.id));
    expect(joined.map((m) => [m.companyId, m.role])).toEqual([[companyA.companyId, "manager"]]);
  });

  it("a used link is refused the second time", async () => {
    const email = `twice-${Date.now()}@fixture.example`;
    await invite(ownerA, email, "technician");
    await deliverDueMail();
    const token = tokenFromLink(linkIn((await mailTo(sink, email))[0]!, "/invite/"));

    expect((await accept(token, { name: "First", password: "first-password-123" })).status).toBe(302);
    const again = await accept(token, { name: "Second", password: "second-password-123" });
    expect(again.status).toBe(410);
    expect(again.body).toMatchObject({ formError: expect.stringContaining("already been used") });
    const view = await callRoute(invitePage.loader, new Request(`http://localhost:3000/invite/${token}`), { token });
    expect(view.body).toMatchObject({ invitation: { state: "used" } });
  });

  it("an expired link is refused and creates nothing", async () => {
    const email = `late-${Date.now()}@fixture.example`;
    const scopeA = await scopeFor(requestAs(ownerA, "/team"), "team");
    // Sent 8 days ago: the link lived 7 days, so it ended a day ago.
    const result = await inviteMember(scopeA, { email, role: "analyst" }, new Date(Date.now() - 8 * 86_400_000));
    expect(result.ok).toBe(true);
    await deliverDueMail();
    const token = tokenFromLink(linkIn((await mailTo(sink, email))[0]!, "/invite/"));

    const view = await callRoute(invitePage.loader, new Request(`http://localhost:3000/invite/${token}`), { token });
    expect(view.body).toMatchObject({ invitation: { state: "expired" } });
    const refused = await accept(token, { name: "Late", password: "late-password-1234" });
    expect(refused.status).toBe(410);
    expect(await db().select().from(user).where(eq(user.email, email))).toHaveLength(0);
  });

  it("a link from company A joins company A only, and company B cannot see or withdraw it", async () => {
    const email = `crossing-${Date.now()}@fixture.example`;
    await invite(ownerA, email, "owner");
    const [row] = await db().select().from(invitations).where(eq(invitations.email, email));

    const teamB = await callRoute(teamPage.loader, requestAs(ownerB, "/team"));
    expect(JSON.stringify(teamB.body)).not.toContain(email);
    const withdraw = await callRoute(
      teamInvitations.action,
      requestAs(ownerB, "/team/invitations", { method: "POST", body: formData({ intent: "withdraw", invitationId: String(row!.id) }) }),
    );
    expect(withdraw.status).toBe(404);

    await deliverDueMail();
    const token = tokenFromLink(linkIn((await mailTo(sink, email))[0]!, "/invite/"));
    const response = await acceptForCookie(token, { name: "Crossing", password: "crossing-password-1" });
    const cookie = response.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
    const scope = await scopeFor(new Request("http://localhost:3000/", { headers: { Cookie: cookie } }), "team");
    expect(scope.companyId).toBe(companyA.companyId);
    expect(scope.companyId).not.toBe(companyB.companyId);
    // Spent: the same token cannot open a way into any company now.
    expect((await accept(token, { name: "Again", password: "crossing-password-2" })).status).toBe(410);
  });

  it("only owners invite, bad input names the field, and a member cannot be invited twice", async () => {
    const technician = await createMember(companyA.companyId, "technician");
    const refused = await invite(technician, "someone@fixture.example", "manager");
    expect(refused.status).toBe(403);

    const badEmail = await invite(ownerA, "not-an-address", "manager");
    expect(badEmail.status).toBe(400);
    expect(badEmail.body).toMatchObject({ fieldErrors: { email: expect.any(String) } });
    const badRole = await invite(ownerA, "someone@fixture.example", "boss");
    expect(badRole.status).toBe(400);
    expect(badRole.body).toMatchObject({ fieldErrors: { role: expect.stringContaining("owner, manager, technician, analyst") } });

    const existing = await invite(ownerA, technician.email, "manager");
    expect(existing.status).toBe(409);
    expect(existing.body).toMatchObject({ fieldErrors: { email: expect.stringContaining("already a member") } });
  });

  it("a short or mismatched password is refused with the field named, and the link still works afterwards", async () => {
    const email = `careful-${Date.now()}@fixture.example`;
    await invite(ownerA, email, "technician");
    await deliverDueMail();
    const token = tokenFromLink(linkIn((await mailTo(sink, email))[0]!, "/invite/"));
    const short = await accept(token, { name: "Careful", password: "short" });
    expect(short.status).toBe(400);
    expect(short.body).toMatchObject({ fieldErrors: { password: expect.stringContaining("12") } });
    const mismatch = await accept(token, { name: "Careful", password: "careful-password-1", confirm: "careful-password-2" });
    expect(mismatch.status).toBe(400);
    expect(mismatch.body).toMatchObject({ fieldErrors: { confirm: expect.any(String) } });
    expect((await accept(token, { name: "Careful", password: "careful-password-1" })).status).toBe(302);
  });

  it("the invitation mail goes out once per invitation", async () => {
    const email = `once-${Date.now()}@fixture.example`;
    await invite(ownerA, email, "analyst");
    await deliverDueMail();
    await deliverDueMail();
    expect(await mailTo(sink, email)).toHaveLength(1);
    const rows = await db().select().from(mailOutbox).where(eq(mailOutbox.recipient, email));
    expect(rows.map((r) => [r.kind, r.status, r.attempts])).toEqual([["invitation", "sent", 1]]);
  });

  it("the mailbox shows owners their own company's messages only", async () => {
    const email = `mailbox-${Date.now()}@fixture.example`;
    await invite(ownerA, email, "analyst");
    const [row] = await db().select().from(mailOutbox).where(eq(mailOutbox.recipient, email));

    const listA = await callRoute(mailboxPage.loader, requestAs(ownerA, "/mailbox"));
    expect(listA.status).toBe(200);
    const messages = (listA.body as { messages: Array<{ id: number; recipient: string; status: string }> }).messages;
    expect(messages.find((m) => m.id === row!.id)).toMatchObject({ recipient: email, status: "pending" });

    const openA = await callRoute(mailboxMessagePage.loader, requestAs(ownerA, `/mailbox/${row!.id}`), { messageId: String(row!.id) });
    expect(openA.body).toMatchObject({ message: { id: row!.id, subject: expect.stringContaining("Invitations A") } });

    const listB = await callRoute(mailboxPage.loader, requestAs(ownerB, "/mailbox"));
    expect(JSON.stringify(listB.body)).not.toContain(email);
    const openB = await callRoute(mailboxMessagePage.loader, requestAs(ownerB, `/mailbox/${row!.id}`), { messageId: String(row!.id) });
    expect(openB.status).toBe(404);

    const managerA = await createMember(companyA.companyId, "manager");
    expect((await callRoute(mailboxPage.loader, requestAs(managerA, "/mailbox"))).status).toBe(403);
    expect((await callRoute(mailboxPage.loader, requestAs(null, "/mailbox"))).status).toBe(302);
    await deliverDueMail();
  });
});
