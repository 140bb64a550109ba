/** Tidewire's mark: a tide line crossed by a signal wire, and a dotted ring for a mark's true place. */
export function LogoMark({ className = "h-8 w-8", tone = "light" }: { className?: string; tone?: "light" | "dark" }) {
  // "light" sits on the deep-blue header: a foam tile with deep water lines.
  const tile = tone === "light" ? "#f3f7f8" : "#0b4f6c";
  const wave1 = tone === "light" ? "#1b7f93" : "#cfe9ee";
  const wave2 = tone === "light" ? "#0b4f6c" : "#1b7f93";
  const wire = tone === "light" ? "#0f2530" : "#ffffff";
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true" focusable="false">
      <rect width="32" height="32" rx="7" fill={tile} />
      <path d="M4 20c3-3 5-3 8 0s5 3 8 0 5-3 8 0" fill="none" stroke={wave1} strokeWidth="2.2" strokeLinecap="round" />
      <path d="M4 25c3-3 5-3 8 0s5 3 8 0 5-3 8 0" fill="none" stroke={wave2} strokeWidth="2" strokeLinecap="round" />
      <path d="M9 6 L23 15" stroke={wire} strokeWidth="1.6" strokeLinecap="round" />
      <circle cx="23" cy="15" r="5" fill="none" stroke="#d9661f" strokeWidth="1.4" strokeDasharray="2 1.6" />
      <circle cx="23" cy="15" r="1.9" fill="#d9661f" />
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
