/**
 * Coretrail's mark: a core (the ring) followed by the stations it passes (the trail of dots).
 * Plain text beside it, so the name is read, copied and found like any other word on the page.
 */
export function Mark({ size = 28 }: { size?: number }) {
  return (
    <svg
      viewBox="0 0 28 16"
      width={size}
      height={(size * 16) / 28}
      aria-hidden="true"
      focusable="false"
      className="shrink-0"
    >
      <circle cx="7.5" cy="8" r="5.25" fill="none" stroke="currentColor" strokeWidth="2.5" />
      <circle cx="7.5" cy="8" r="1.6" fill="currentColor" />
      <circle cx="17.5" cy="8" r="1.9" fill="currentColor" />
      <circle cx="24.5" cy="8" r="1.9" fill="currentColor" opacity="0.55" />
    </svg>
  );
}

export function Wordmark({ large = false }: { large?: boolean }) {
  return (
    <span className={`inline-flex items-center gap-2 text-accent ${large ? 'text-2xl' : 'text-lg'}`}>
      <Mark size={large ? 40 : 30} />
      <span className="font-semibold tracking-tight text-ink">Coretrail</span>
    </span>
  );
}
