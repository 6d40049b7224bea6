/** Shown on every page that carries repair guidance. */
export function SafetyNote() {
  return (
    <p
      role="note"
      className="rounded-md border border-ochre-500/40 bg-ochre-100 px-4 py-3 text-sm text-ink"
    >
      <strong>Safety.</strong> Repair information in Recurra is informational. Manufacturer
      procedures, local codes and licensed practice come first. Wear eye and hand protection, and
      take the cautions shown with each job seriously: electrical and fuel-vapour work, airbags,
      steering, lifting, hot fluids and high voltage on hybrid and electric vehicles.
    </p>
  );
}
