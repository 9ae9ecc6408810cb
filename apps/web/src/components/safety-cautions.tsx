/** Brief cautions shown wherever a screen guides hazardous work. */
export function SafetyCautions() {
  return (
    <aside aria-labelledby="safety-h" className="rounded-lg border border-sev-minor/40 bg-amber-50 px-4 py-3 text-sm text-ink-800">
      <h2 id="safety-h" className="flex items-center gap-2 font-semibold text-ink-950">
        <span aria-hidden="true">⚠</span> Before you open the circuit
      </h2>
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        <li>Refrigerant displaces oxygen: ventilate enclosed spaces and plant rooms.</li>
        <li>Wear eye and hand protection; liquid refrigerant causes frostbite.</li>
        <li>Never heat a cylinder or fill it past its safe maximum.</li>
        <li>Follow the recovery equipment maker&apos;s instructions.</li>
      </ul>
      <p className="mt-1 text-ink-600">Local codes and licensed practice take precedence over this app.</p>
    </aside>
  );
}
