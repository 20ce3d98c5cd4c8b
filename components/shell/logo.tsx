export function LogoMark({ className = "size-7" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true">
      <rect width="32" height="32" rx="7" fill="#0b5d6b" />
      <path d="M9 24V8m14 16V8M9 16h14" stroke="#fff" strokeWidth="3" strokeLinecap="round" />
      <path d="M6 11.5h20" stroke="#b9dfe6" strokeWidth="1.6" strokeDasharray="2 2.2" />
    </svg>
  );
}

export function Logo({ inverted = false }: { inverted?: boolean }) {
  return (
    <span className="flex items-center gap-2.5">
      <LogoMark />
      <span className={`text-[17px] font-semibold tracking-tight ${inverted ? "text-white" : "text-ink-950"}`}>Headroom</span>
    </span>
  );
}
