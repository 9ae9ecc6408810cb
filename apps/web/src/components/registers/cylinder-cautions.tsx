/** Brief cautions on screens about handling recovery cylinders. */
export function CylinderCautions() {
  return (
    <aside aria-labelledby="cylinder-safety-h" className="rounded-lg border border-sev-minor/40 bg-amber-50 px-4 py-3 text-sm text-ink-800">
      <h2 id="cylinder-safety-h" className="flex items-center gap-2 font-semibold text-ink-950">
        <span aria-hidden="true">⚠</span> Handling cylinders
      </h2>
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        <li>Never heat a cylinder, and never fill it past its maximum: liquid expands and can burst it.</li>
        <li>Do not fill a cylinder whose requalification date has passed.</li>
        <li>One refrigerant per recovery cylinder.</li>
        <li>Wear eye and hand protection when connecting or weighing; refrigerant displaces oxygen in enclosed spaces.</li>
      </ul>
      <p className="mt-1 text-ink-600">Local codes and licensed practice take precedence over this app.</p>
    </aside>
  );
}
