/** Benches to choose from, grouped by zone (built by the page from the layout). */
export type BenchGroup = { zoneId: number; zoneName: string; benches: { id: number; name: string }[] };

/** `<option>`s of every bench, in `<optgroup>`s per zone. */
export function BenchOptions({ groups, exceptId }: { groups: readonly BenchGroup[]; exceptId?: number }) {
  return (
    <>
      {groups.map((g) => (
        <optgroup key={g.zoneId} label={g.zoneName}>
          {g.benches
            .filter((b) => b.id !== exceptId)
            .map((b) => (
              <option key={b.id} value={b.id}>
                {b.name} · {g.zoneName}
              </option>
            ))}
        </optgroup>
      ))}
    </>
  );
}
