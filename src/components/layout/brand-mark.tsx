/** Fringewalk's mark: nested field loops around a magnet bar, with a walker's dotted path. */
export function BrandMark({ className = '' }: { className?: string }) {
  return (
    <svg viewBox="0 0 64 64" aria-hidden="true" className={className} fill="none">
      <rect width="64" height="64" rx="14" fill="#0a302e" />
      <g stroke="#e6aa78" strokeWidth="3" strokeLinecap="round">
        <ellipse cx="32" cy="32" rx="24" ry="14" />
        <ellipse cx="32" cy="32" rx="15" ry="8" />
      </g>
      <rect x="26" y="28" width="12" height="8" rx="2" fill="#78c4bb" />
      <path d="M10 54 C 22 46, 42 58, 54 46" stroke="#a9dcd5" strokeWidth="3" strokeLinecap="round" strokeDasharray="1 6" />
    </svg>
  );
}
