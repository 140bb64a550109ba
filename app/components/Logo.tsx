/** Tidewire's mark: a tide line crossed by a signal wire, and a dotted ring for a mark's true place. */
export function LogoMark({ className = "h-8 w-8" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true" focusable="false">
      <rect width="32" height="32" rx="7" fill="#0b4f6c" />
      <path d="M4 20c3-3 5-3 8 0s5 3 8 0 5-3 8 0" fill="none" stroke="#cfe9ee" strokeWidth="2.2" strokeLinecap="round" />
      <path d="M4 25c3-3 5-3 8 0s5 3 8 0 5-3 8 0" fill="none" stroke="#1b7f93" strokeWidth="2" strokeLinecap="round" />
      <path d="M9 6 L23 15" stroke="#ffffff" strokeWidth="1.6" strokeLinecap="round" />
      <circle cx="23" cy="15" r="5" fill="none" stroke="#f6a15a" strokeWidth="1.4" strokeDasharray="2 1.6" />
      <circle cx="23" cy="15" r="1.9" fill="#f6a15a" />
    </svg>
  );
}

export function Logo() {
  return (
    <span className="inline-flex items-center gap-2">
      <LogoMark />
      <span className="text-xl font-bold tracking-tight text-white">Tidewire</span>
    </span>
  );
}
