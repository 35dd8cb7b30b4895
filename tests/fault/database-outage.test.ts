import type { ChildProcess } from "node:child_process";
import { setTimeout as sleep } from "node:timers/promises";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getAnswer, signInOverHttp, type Answer } from "../fixtures/http";
import { FAULT_DATABASE_URL, FAULT_SERVER_PORT, FAULT_SERVER_URL, faultDatabase } from "../fixtures/scratch-mariadb";
import { startBuiltServer, stopBuiltServer } from "../fixtures/server";

const JSON_PATHS = ["/api/analytics/summary", "/api/summary", "/api/analytics/trend"];

function expectUnavailableJson(answer: Answer) {
  expect(answer.status).toBe(503);
  expect(answer.contentType).toMatch(/application\/json/);
  expect(Number(answer.retryAfter)).toBeGreaterThan(0);
  const body = JSON.parse(answer.body) as { error: { code: string; message: string } };
  expect(body.error.code).toBe("unavailable");
  expect(body.error.message).toMatch(/cannot reach its database/);
}

/** Keeps asking until the answer is 200 (the database is back), at most `tries` times. */
async function untilOk(path: string, cookie: string, tries = 120): Promise<Answer[]> {
  const answers: Answer[] = [];
  for (let i = 0; i < tries; i++) {
    const answer = await getAnswer(FAULT_SERVER_URL, path, cookie);
    answers.push(answer);
    if (answer.status === 200) break;
    await sleep(250);
  }
  return answers;
}

describe("a database outage, on a running built server", () => {
  let server: ChildProcess;
  let cookie: string;

  beforeAll(async () => {
    server = await startBuiltServer(FAULT_DATABASE_URL, { port: FAULT_SERVER_PORT });
    cookie = await signInOverHttp(FAULT_SERVER_URL, "owner");
  });

  afterAll(async () => {
    await stopBuiltServer(server);
    await faultDatabase("start");
  });

  it("answers 503 with the API's error shape and Retry-After while the database is down, and 200 after it is back without a restart", async () => {
    for (const path of JSON_PATHS) expect((await getAnswer(FAULT_SERVER_URL, path, cookie)).status).toBe(200);
    const pid = server.pid;

    // Requests keep running while the database stops.
    const duringStop: Answer[] = [];
    let stopped = false;
    const stopping = faultDatabase("stop").then(() => (stopped = true));
    while (!stopped) duringStop.push(await getAnswer(FAULT_SERVER_URL, "/api/analytics/summary", cookie));
    await stopping;
    for (const answer of duringStop) expect([200, 503]).toContain(answer.status);

    for (const path of JSON_PATHS) expectUnavailableJson(await getAnswer(FAULT_SERVER_URL, path, cookie));

    // Pages keep the error panel, as a 503.
    const home = await getAnswer(FAULT_SERVER_URL, "/", cookie);
    expect(home.status).toBe(503);
    expect(home.body).toMatch(/Error (<!-- -->)?503/);
    expect(home.body).toContain("cannot reach its database");

    // Signing in is a 503 page saying so, not a 500 and not "wrong password".
    const form = new URLSearchParams({ email: "owner@patina.example", password: "owner-demo-2026", next: "/" });
    const signIn = await fetch(`${FAULT_SERVER_URL}/sign-in`, {
      method: "POST",
      body: form,
      headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: FAULT_SERVER_URL },
      redirect: "manual",
    });
    const signInPage = await signIn.text();
    expect(signIn.status).toBe(503);
    expect(Number(signIn.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(signInPage).toContain("cannot reach its database");

    await faultDatabase("start");
    const afterStart = await untilOk("/api/analytics/summary", cookie);
    for (const answer of afterStart.slice(0, -1)) expectUnavailableJson(answer);
    expect(afterStart.at(-1)!.status).toBe(200);
    for (const path of JSON_PATHS) expect((await getAnswer(FAULT_SERVER_URL, path, cookie)).status).toBe(200);
    expect((await getAnswer(FAULT_SERVER_URL, "/", cookie)).status).toBe(200);

    // The same process answered throughout.
    expect(server.pid).toBe(pid);
    expect(server.exitCode).toBeNull();
    console.info(
      `[outage] ${duringStop.length} requests while stopping (${duringStop.filter((a) => a.status === 503).length} answered 503), ` +
        `${afterStart.length} tries until the first 200 after the start`,
    );
  });
});
