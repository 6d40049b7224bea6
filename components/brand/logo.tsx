/** Recurra's mark: an R whose leg returns as a loop, for failures that come back. */
export function LogoMark({ size = 28 }: { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true" focusable="false">
      <rect width="32" height="32" rx="7" fill="#1c2830" />
      <path
        d="M9 22V10h7.5a4.5 4.5 0 0 1 0 9H12"
        fill="none"
        stroke="#f5f3ee"
        strokeWidth="2.6"
        strokeLinecap="round"
        strokeLinejoin="round"
      />
      <path d="M16.5 19l5 4.5" stroke="#c27412" strokeWidth="2.6" strokeLinecap="round" />
      <circle cx="23.5" cy="23.5" r="1.9" fill="#c27412" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="flex items-center gap-2 text-lg font-semibold tracking-tight text-ink">
      <LogoMark />
      Recurra
    </span>
  );
}
