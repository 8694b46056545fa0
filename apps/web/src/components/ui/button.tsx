import type { ButtonHTMLAttributes } from "react";

type Variant = "primary" | "secondary" | "quiet";

const variants: Record<Variant, string> = {
  primary: "bg-stream-700 text-white hover:bg-stream-800 disabled:bg-ink-400",
  secondary: "bg-surface text-ink-900 border border-field hover:bg-ink-50 disabled:text-ink-500",
  quiet: "text-stream-700 hover:bg-stream-50 disabled:text-ink-500",
};

export type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant };

export function Button({ variant = "primary", className = "", type = "button", ...props }: ButtonProps) {
  return (
    <button
      type={type}
      className={`inline-flex items-center justify-center gap-2 rounded-md px-3.5 py-2 text-small font-medium transition-colors disabled:cursor-not-allowed ${variants[variant]} ${className}`}
      {...props}
    />
  );
}
