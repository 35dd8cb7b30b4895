/**
 * How Patina marks a reading's or a pool's state: by shape and word first,
 * colour only as a second cue. "Fine" is the plain word, with no mark and no
 * colour of its own; a diamond is "between levels, worth a look"; a triangle
 * is "above, act on it".
 */
export type StateLevel = "fine" | "between" | "above";

const SHAPE: Record<StateLevel, string> = { fine: "", between: "◆", above: "▲" };
const STYLE: Record<StateLevel, string> = { fine: "", between: "text-watch", above: "text-alert font-semibold" };

export function StateMark({ level, children }: { level: StateLevel; children: string }) {
  return (
    <span className={STYLE[level]} data-state={level}>
      {SHAPE[level] ? (
        <span aria-hidden="true" className="mr-1">
          {SHAPE[level]}
        </span>
      ) : null}
      {children}
    </span>
  );
}
