import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { type MailSink, readStoredMail, startMailSink } from "../../.dev/mail-sink";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { BROWSER_TEST_SMTP_URL, BROWSER_TEST_URL } from "../fixtures/server";
import { signInAs } from "../fixtures/sign-in";

// The built server sends to BROWSER_TEST_SMTP_URL. This file
// listens there itself unless a sink started by the test script already does;
// that one's folder is then read from PATINA_MAIL_SINK_DIR.
const smtpPort = Number(new URL(BROWSER_TEST_SMTP_URL).port);

const browser = browserPerFile();
let ownSink: (MailSink & { dir: string }) | null = null;

beforeAll(async () => {
  const dir = await mkdtemp(path.join(tmpdir(), "patina-e2e-mail-"));
  try {
    ownSink = { ...(await startMailSink({ port: smtpPort, storeDir: dir })), dir };
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== "EADDRINUSE") throw error;
    await rm(dir, { recursive: true, force: true });
  }
});

afterAll(async () => {
  if (ownSink) {
    await ownSink.stop();
    await rm(ownSink.dir, { recursive: true, force: true });
  }
});

describe("an invitation sent from the team page", () => {
  it("is mailed, and its link signs the new member up in the owner's company with the chosen role", async () => {
    const invitee = `e2e-${Date.now()}@fixture.example`;
    const ownerContext = await phoneContext(browser());
    const page = await ownerContext.newPage();
    await signInAs(page, "owner", "/team");
    await page.getByRole("heading", { level: 2, name: "Invite someone" }).waitFor();

    const form = page.locator("section", { has: page.getByRole("heading", { name: "Invite someone" }) });
    await form.getByLabel("E-mail").fill(invitee);
    await form.getByLabel("Role").selectOption("manager");
    await form.getByRole("button", { name: "Send invitation" }).click();
    await expect.poll(() => page.getByRole("status").innerText()).toContain(`Invitation sent to ${invitee}`);
    expect(await page.getByText(invitee).count()).toBeGreaterThan(0);

    // The server's own sender delivers it; the mailbox shows it as sent.
    await page.goto(`${BROWSER_TEST_URL}/mailbox`);
    const row = page.getByRole("link", { name: new RegExp(`to ${invitee.replace(/[.]/g, "\\.")}`) });
    await expect
      .poll(async () => {
        await page.reload();
        return row.innerText();
      })
      .toContain("Sent");
    await row.click();
    const text = await page.locator("pre").innerText();
    const link = /http:\/\/\S+\/invite\/[A-Za-z0-9_-]+/.exec(text)?.[0];
    expect(link).toBeDefined();

    const sinkDir = ownSink?.dir ?? process.env.PATINA_MAIL_SINK_DIR;
    if (sinkDir) {
      const received = (await readStoredMail(sinkDir)).filter((m) => m.to.includes(invitee));
      expect(received).toHaveLength(1);
      expect(received[0]!.text).toContain(link!);
    }

    const inviteeContext = await phoneContext(browser());
    const invitePage = await inviteeContext.newPage();
    await invitePage.goto(link!.replace(/^http:\/\/[^/]+/, BROWSER_TEST_URL));
    await invitePage.getByRole("heading", { name: /Join / }).waitFor();
    await invitePage.getByLabel("Your name").fill("Marin Eskdale");
    await invitePage.getByLabel("Password", { exact: true }).fill("marin-password-2026");
    await invitePage.getByLabel("Password again").fill("marin-password-2026");
    await invitePage.getByRole("button", { name: "Join and sign in" }).click();
    await invitePage.getByRole("heading", { level: 1, name: /Your routes at a glance/ }).waitFor();
    expect(await invitePage.getByText("Manager ·").count()).toBeGreaterThan(0);

    // The link is spent now.
    await invitePage.goto(link!.replace(/^http:\/\/[^/]+/, BROWSER_TEST_URL));
    await invitePage.getByText("already been used").waitFor();
    await inviteeContext.close();
    await ownerContext.close();
  });
});
