/** The standing caution on every page that shows positions. */
export function Caution({ compact = false }: { compact?: boolean }) {
  return (
    <aside
      aria-label="Caution"
      className={`rounded-md border border-warn/40 bg-warn-light text-ink ${compact ? "px-3 py-2 text-xs" : "px-4 py-3 text-sm"}`}
    >
      <strong>Caution.</strong> Tidewire informs; it does not replace official charts, official notices to mariners, local
      regulations, licensed practice or a proper lookout. Positions are as reported or entered and may contain errors.
    </aside>
  );
}
