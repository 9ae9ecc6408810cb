import { REFRIGERANTS } from "@coldtrail/core";

/** Suggestions for a refrigerant input (`list={id}`): every catalogued designation. */
export function RefrigerantList({ id }: { id: string }) {
  return (
    <datalist id={id}>
      {REFRIGERANTS.map((r) => (
        <option key={r.designation} value={r.designation} />
      ))}
    </datalist>
  );
}
