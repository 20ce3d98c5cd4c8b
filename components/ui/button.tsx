import type { ButtonHTMLAttributes } from "react";

type Variant = "primary" | "secondary" | "danger" | "ghost";

const styles: Record<Variant, string> = {
  primary: "bg-accent-700 text-white hover:bg-accent-800 disabled:bg-accent-500/60 border border-transparent",
  secondary: "bg-white text-ink-900 border border-ink-300 hover:bg-ink-100 disabled:text-ink-400",
  danger: "bg-white text-sev-critical border border-ink-300 hover:bg-sev-critical-bg disabled:text-ink-400",
  ghost: "bg-transparent text-ink-700 border border-transparent hover:bg-ink-100",
};

export function buttonClass(variant: Variant = "primary", size: "sm" | "md" = "md"): string {
  const sizing = size === "sm" ? "h-8 px-3 text-sm" : "h-10 px-4 text-sm";
  return `inline-flex items-center justify-center gap-2 rounded-md font-medium transition-colors disabled:cursor-not-allowed ${sizing} ${styles[variant]}`;
}

export function Button({
  variant = "primary",
  size = "md",
  className = "",
  ...props
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant; size?: "sm" | "md" }) {
  return <button type="button" {...props} className={`${buttonClass(variant, size)} ${className}`} />;
}
