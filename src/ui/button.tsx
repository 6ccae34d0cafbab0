/** Buttons and button-styled links. Plain components: usable from server and client code. */
import Link from "next/link";
import type { ButtonHTMLAttributes, ComponentProps } from "react";

export type ButtonVariant = "primary" | "secondary" | "danger" | "quiet";

const BASE =
  "inline-flex min-h-10 items-center justify-center gap-1.5 rounded-md px-3.5 py-2 text-sm font-medium " +
  "transition-colors focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-tide-600 " +
  "disabled:cursor-not-allowed disabled:opacity-60";

const VARIANT: Record<ButtonVariant, string> = {
  primary: "bg-tide-700 text-white hover:bg-tide-800 shadow-sm",
  secondary: "border border-ink-200 bg-white text-ink-800 hover:bg-ink-50 shadow-sm",
  danger: "border border-storm-500/50 bg-white text-storm-700 hover:bg-storm-50",
  quiet: "text-ink-700 hover:bg-ink-100",
};

export function buttonClass(variant: ButtonVariant = "primary", extra = ""): string {
  return `${BASE} ${VARIANT[variant]} ${extra}`.trim();
}

export function Button({
  variant = "primary",
  className = "",
  type = "button",
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: ButtonVariant }) {
  return <button type={type} className={buttonClass(variant, className)} {...rest} />;
}

export function LinkButton({
  variant = "secondary",
  className = "",
  ...rest
}: ComponentProps<typeof Link> & { variant?: ButtonVariant }) {
  return <Link className={buttonClass(variant, className)} {...rest} />;
}
