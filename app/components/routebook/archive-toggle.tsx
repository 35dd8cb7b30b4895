/** The "in use" box of a route-book form: unticking archives, ticking restores. */
export function ArchiveToggle({ active, explanation }: { active: boolean; explanation: string }) {
  return (
    <div className="space-y-1">
      {active ? null : (
        <p role="status" className="rounded-lg bg-paper px-3 py-2 text-sm font-medium">
          Archived. Tick “In use” and save to restore it.
        </p>
      )}
      <label className="flex items-center gap-2">
        <input type="checkbox" name="active" defaultChecked={active} className="size-5 accent-verdigris-700" />
        <span>In use ({explanation})</span>
      </label>
    </div>
  );
}
