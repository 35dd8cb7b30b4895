import { Link } from "react-router";
import { type KeptVisit, forgetVisit, useKeptVisits } from "~/lib/offline/kept-visits";
import { type KeepState, useOnline } from "~/lib/offline/keep-pages";
import { formatDateTime } from "~/lib/format";

/** A banner while the phone has no signal: saving still works, and says where the visit goes. */
export function NoSignalNotice() {
  const online = useOnline();
  if (online) return null;
  return (
    <p role="status" className="rounded-xl border border-watch bg-yellow-50 p-3 text-sm">
      <span className="font-semibold">No signal.</span> Visits you save are kept on this phone and sent when the signal
      returns.
    </p>
  );
}

/** Whether this list and its pools' forms are ready for use without signal. */
export function KeptPagesNote({ keep, pools }: { keep: KeepState; pools: number }) {
  if (keep.state !== "kept") return null;
  const { failed } = keep.answer;
  return (
    <p className="text-sm text-muted" data-kept-pages={failed === 0 ? "all" : "some"}>
      {failed === 0
        ? `Ready for no signal: this list and the forms of its ${pools} ${pools === 1 ? "pool" : "pools"} are kept on this phone.`
        : `Ready for no signal, except ${failed} ${failed === 1 ? "page" : "pages"} that could not be fetched; open them once with signal.`}
    </p>
  );
}

function VisitLine({ visit, timeZone }: { visit: KeptVisit; timeZone: string }) {
  if (visit.state === "waiting") {
    return (
      <li className="rounded-xl border border-line bg-white px-4 py-3" data-kept-visit={visit.key}>
        <span className="block font-medium">{visit.poolLabel}</span>
        <span className="block text-sm text-muted">Saved {formatDateTime(visit.keptAt, timeZone)} · Waiting for signal</span>
      </li>
    );
  }
  const discard = () => {
    if (window.confirm(`Discard the visit to ${visit.poolLabel}? Its readings are lost.`)) void forgetVisit(visit.key);
  };
  return (
    <li className="rounded-xl border border-alert bg-white px-4 py-3" data-kept-visit={visit.key}>
      <span className="block font-medium">{visit.poolLabel}</span>
      <span className="block text-sm text-muted">Saved {formatDateTime(visit.keptAt, timeZone)} · Not stored: needs a fix</span>
      {visit.answer?.formError ? <span className="mt-1 block text-sm text-alert">{visit.answer.formError}</span> : null}
      <span className="mt-2 flex flex-wrap gap-3">
        <Link to={`/visit/${visit.poolId}`} state={{ fixKeptVisit: visit.key }} className="font-medium text-verdigris-700 underline">
          Fix and save again
        </Link>
        <button type="button" onClick={discard} className="text-sm text-muted underline">
          Discard
        </button>
      </span>
    </li>
  );
}

/**
 * The visits kept on this phone that the server does not have yet: waiting
 * for signal, or refused and waiting for a fix. Visits another member left on
 * this phone are counted, not shown, and are sent when they sign in here.
 */
export function KeptVisitsPanel({ memberId, timeZone, poolId }: { memberId: string; timeZone: string; poolId?: number }) {
  const all = useKeptVisits();
  if (!all) return null;
  const mine = all.filter((v) => v.memberId === memberId && (poolId === undefined || v.poolId === poolId));
  const others = poolId === undefined ? all.filter((v) => v.memberId !== memberId).length : 0;
  if (mine.length === 0 && others === 0) return null;
  const waiting = mine.filter((v) => v.state === "waiting").length;
  return (
    <section aria-labelledby="kept-visits" className="space-y-2">
      <h2 id="kept-visits" className="font-semibold">
        Kept on this phone: {mine.length} {mine.length === 1 ? "visit" : "visits"}
      </h2>
      {waiting > 0 ? <p className="text-sm text-muted">Sent by themselves when the phone has signal; keep this app open or open it again later.</p> : null}
      <ul className="space-y-2">
        {mine.map((visit) => (
          <VisitLine key={visit.key} visit={visit} timeZone={timeZone} />
        ))}
      </ul>
      {others > 0 ? (
        <p className="text-sm text-muted">
          {others} {others === 1 ? "visit" : "visits"} saved here by another member: sent when they sign in on this phone.
        </p>
      ) : null}
    </section>
  );
}
