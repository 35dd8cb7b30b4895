import { useEffect, useRef } from "react";
import { isRouteErrorResponse, redirect, useFetcher } from "react-router";
import { answerOf, forgetVisit, keepVisit, type KeptVisit, keptVisit, keptVisits, resendForm } from "./kept-visits";

/** Where the form goes after keeping a visit it could not send: the day's list, which shows it waiting. */
export const KEPT_VISIT_LIST = "/visit";

/** What a resend from the list answers; the page stays where it is. */
export type ResendOutcome = { resend: "stored" | "waiting" | "refused" };

/** The action's answer to a stored visit: a redirect to the pool page with the saved test. */
function isStoredAnswer(thrown: unknown): thrown is Response {
  return thrown instanceof Response && /^\/pools\/\d+\?saved=\d+$/.test(thrown.headers.get("Location") ?? "");
}

function refusalMessage(error: { status: number; statusText: string; data: unknown }): string {
  return typeof error.data === "string" && error.data ? error.data : `The server refused this visit (${error.status} ${error.statusText}).`;
}

/**
 * Sends a visit to the server's action, keeping it on the phone until the
 * server has answered. Stored: forgotten. Refused by the form's checks: a
 * fresh submit shows the answer on the form at once (and forgets it, the form
 * still holds the values); a resend keeps it as refused with the server's
 * messages for the technician to fix. No connection, or a server that could
 * not answer (5xx): kept as waiting, and a fresh submit moves on to the list.
 */
export async function sendVisit<T>(visit: KeptVisit, serverAction: () => Promise<T>, resend: boolean): Promise<T | ResendOutcome | Response> {
  await keepVisit(visit);
  const waiting = () => (resend ? { resend: "waiting" as const } : redirect(KEPT_VISIT_LIST));
  if (!navigator.onLine) return waiting();
  let answer: T;
  try {
    answer = await serverAction();
  } catch (thrown) {
    if (isStoredAnswer(thrown)) {
      await forgetVisit(visit.key);
      if (resend) return { resend: "stored" };
      throw thrown;
    }
    // Another redirect (the session ended): kept, sent once the technician is signed in again.
    if (thrown instanceof Response) {
      if (resend) return { resend: "waiting" };
      throw thrown;
    }
    if (isRouteErrorResponse(thrown) && thrown.status < 500) {
      await keepVisit({ ...visit, state: "refused", answer: { fieldErrors: {}, formError: refusalMessage(thrown) } });
      if (resend) return { resend: "refused" };
      throw thrown;
    }
    return waiting();
  }
  if (resend) {
    await keepVisit({ ...visit, state: "refused", answer: answerOf(answer) });
    return { resend: "refused" };
  }
  await forgetVisit(visit.key);
  return answer;
}

let sending = false;

/**
 * Sends this member's waiting visits, one at a time, through the visit
 * form's own action: when the page opens, when the phone comes back online,
 * and every half minute while any wait (a weak signal can say online and
 * still fail). Stops at the first that cannot get through.
 */
export function useKeptVisitSender(memberId: string): void {
  const { submit } = useFetcher({ key: "kept-visits" });
  const submitRef = useRef(submit);
  useEffect(() => {
    submitRef.current = submit;
  });
  useEffect(() => {
    let stopped = false;
    const sendWaiting = async () => {
      if (sending || !navigator.onLine) return;
      sending = true;
      try {
        for (const visit of await keptVisits()) {
          if (stopped || !navigator.onLine) break;
          if (visit.memberId !== memberId || visit.state !== "waiting") continue;
          await submitRef.current(resendForm(visit), { method: "post", action: `/visit/${visit.poolId}` });
          if ((await keptVisit(visit.key))?.state === "waiting") break;
        }
      } catch {
        // Tried again on the next occasion.
      } finally {
        sending = false;
      }
    };
    void sendWaiting();
    const onOnline = () => void sendWaiting();
    window.addEventListener("online", onOnline);
    const retry = window.setInterval(onOnline, 30_000);
    return () => {
      stopped = true;
      window.removeEventListener("online", onOnline);
      window.clearInterval(retry);
    };
  }, [memberId]);
}
