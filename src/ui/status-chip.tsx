/**
 * A status shown as word + icon + colour, never colour alone. `title` carries reasons
 * (shown on hover; the same text is in the accessible name so a tap or screen reader gets it).
 */
import type { ComponentType, SVGProps } from "react";
import { AlertIcon, CheckIcon, InfoIcon, StopIcon } from "./icons";

export type ChipTone = "ok" | "warn" | "stop" | "info" | "neutral";

const TONE_CLASS: Record<ChipTone, string> = {
  ok: "border-moss-500/40 bg-moss-50 text-moss-700",
  warn: "border-flare-500/50 bg-flare-50 text-flare-700",
  stop: "border-storm-500/40 bg-storm-50 text-storm-700",
  info: "border-tide-500/40 bg-tide-50 text-tide-800",
  neutral: "border-ink-200 bg-ink-50 text-ink-700",
};

const TONE_ICON: Record<ChipTone, ComponentType<SVGProps<SVGSVGElement> & { size?: number }>> = {
  ok: CheckIcon,
  warn: AlertIcon,
  stop: StopIcon,
  info: InfoIcon,
  neutral: InfoIcon,
};

export interface StatusChipProps {
  label: string;
  tone: ChipTone;
  icon?: ComponentType<SVGProps<SVGSVGElement> & { size?: number }>;
  /** Reasons or detail, shown on hover and read with the label. */
  detail?: string;
  className?: string;
}

export function StatusChip({ label, tone, icon, detail, className = "" }: StatusChipProps) {
  const Icon = icon ?? TONE_ICON[tone];
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium ${TONE_CLASS[tone]} ${className}`}
      title={detail}
    >
      <Icon size={13} />
      <span>{label}</span>
      {detail ? <span className="sr-only">: {detail}</span> : null}
    </span>
  );
}
