/**
 * The `?next=` return target after sign-in: only a same-site path is accepted, so the
 * parameter cannot send a user to another host.
 */
export function safeNextPath(value: unknown, fallback = "/surveys"): string {
  if (typeof value !== "string") return fallback;
  if (!value.startsWith("/") || value.startsWith("//") || value.startsWith("/\\")) return fallback;
  if (/[\u0000-\u001f]/.test(value)) return fallback;
  return value;
}
