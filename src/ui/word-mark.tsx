/** The Fieldtide word mark: the tide-line mark and the name. */
import { FieldtideMark } from "./icons";

export function WordMark({ tone = "dark" }: { tone?: "dark" | "light" }) {
  return (
    <span className={`inline-flex items-center gap-2 font-semibold tracking-tight ${tone === "light" ? "text-paper-50" : "text-ink-900"}`}>
      <FieldtideMark className={tone === "light" ? "text-tide-300" : "text-tide-700"} />
      <span className="text-lg">Fieldtide</span>
    </span>
  );
}
