/** Lagwise mark: a pipe in cross-section with two layers of lagging and a jacket line. */
export function LogoMark({ size = 28 }: { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true">
      <circle cx="16" cy="16" r="15" fill="#1f4f4c" />
      <circle cx="16" cy="16" r="12" fill="#31978f" />
      <circle cx="16" cy="16" r="8.5" fill="#aee4dd" />
      <circle cx="16" cy="16" r="5" fill="#15181c" />
      <path d="M16 1 A15 15 0 0 1 31 16" stroke="#eec062" strokeWidth="1.6" fill="none" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="flex items-center gap-2 text-ink-950">
      <LogoMark />
      <span className="text-lg font-semibold tracking-tight">Lagwise</span>
    </span>
  );
}
