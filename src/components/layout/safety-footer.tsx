/** DESIGN.md §6: the standing caution, on every screen. */
export function SafetyFooter() {
  return (
    <footer className="border-t border-border bg-surface-sunken px-4 py-4 text-sm text-fg-muted">
      <p className="mx-auto max-w-5xl">
        Fringewalk supports, and does not replace, your site’s MR safety officer, radiation-protection adviser and
        licensed practice. Safety thresholds differ by jurisdiction and by implant: follow local codes. Near strong
        magnets, use non-magnetic tools only.
      </p>
    </footer>
  );
}
