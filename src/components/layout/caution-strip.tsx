/** The caution every screen carries: Legwork assists people who answer for motion safety, never stands in for them. */
export const CAUTION_TEXT =
  "Motion can injure riders and staff. Legwork supports the ride manufacturer's engineering, the applicable codes and a qualified person's sign-off; it never replaces them.";

/** The thin caution strip at the foot of every screen. */
export function CautionStrip() {
  return (
    <footer
      role="note"
      aria-label="Safety caution"
      className="border-t border-signal-400 bg-ink-900 px-4 py-1.5 text-xs text-ink-100"
    >
      <span aria-hidden="true" className="mr-2 font-semibold text-signal-400">
        ▲
      </span>
      {CAUTION_TEXT}
    </footer>
  );
}
