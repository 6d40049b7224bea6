/** A part's audit entry (db/queries/parts.ts) in words, for its "Recent changes". */
export function describePartChange(action: string, detail: unknown): string {
  const d = (detail && typeof detail === "object" ? detail : {}) as Record<string, unknown>;
  const n = (v: unknown) => (typeof v === "number" ? v.toLocaleString("en-GB") : "?");
  switch (action) {
    case "part.create":
      return `added, ${n(d.onHand)} on hand`;
    case "part.receive":
      return `received ${n(d.quantity)} (${n(d.from)} → ${n(d.to)} on hand)`;
    case "part.count":
      return `counted ${n(d.to)} on hand (the list said ${n(d.from)})`;
    case "part.update":
      return "details changed";
    default:
      return action;
  }
}
