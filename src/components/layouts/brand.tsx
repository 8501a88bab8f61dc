/** Sowright's mark: three sown rows curving up, the same drawing as the favicon. */
export function BrandMark({ className = 'size-7' }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden>
      <rect width="32" height="32" rx="6" className="fill-slate-900" />
      <path
        d="M6 22c4-1 6-4 7-9M13 22c4-1 6-4 7-9M20 22c4-1 5-4 6-9"
        className="stroke-clay-300"
        strokeWidth="2.4"
        fill="none"
        strokeLinecap="round"
      />
    </svg>
  );
}

export function Brand() {
  return (
    <span className="flex items-center gap-2">
      <BrandMark />
      <span className="text-lg font-semibold tracking-tight text-ink">Sowright</span>
    </span>
  );
}
