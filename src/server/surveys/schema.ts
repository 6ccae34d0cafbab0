/**
 * Survey form input. No `server-only`: forms reuse the schema and its messages.
 * Derive per use (e.g. SurveyInputSchema.pick({ name: true })) rather than copying.
 */
import "@/src/lib/zod-jitless";
import { z } from "zod";

export const SURVEY_CODE_PATTERN = /^[A-Z0-9][A-Z0-9-]{1,19}$/;
export const CODE_TAKEN = "This code is taken.";

let zoneCache: Set<string> | null = null;

/** True for IANA zone names this runtime knows (canonical names and accepted aliases such as "UTC"). */
export function isValidTimeZone(zone: string): boolean {
  zoneCache ??= new Set(Intl.supportedValuesOf("timeZone"));
  if (zoneCache.has(zone)) return true;
  if (!/^[A-Za-z][A-Za-z0-9_+-]*(\/[A-Za-z0-9_+-]+)*$/.test(zone)) return false;
  try {
    new Intl.DateTimeFormat("en", { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}

const optionalText = (max: number) =>
  z
    .string({ error: "Must be text." })
    .trim()
    .max(max, { error: `At most ${max} characters.` })
    .optional()
    .transform((v) => v ?? "");

export const SurveyInputSchema = z.object({
  name: z
    .string({ error: "Enter a name." })
    .trim()
    .min(1, { error: "Enter a name." })
    .max(120, { error: "At most 120 characters." }),
  code: z
    .string({ error: "Enter a code." })
    .trim()
    .toUpperCase()
    .regex(SURVEY_CODE_PATTERN, { error: "2–20 characters: capital letters, digits and dashes, not starting with a dash." }),
  client: optionalText(120),
  areaDescription: optionalText(2000),
  timeZone: z
    .string({ error: "Choose a time zone." })
    .trim()
    .min(1, { error: "Choose a time zone." })
    .refine(isValidTimeZone, { error: "Not a known IANA time zone (e.g. Europe/London)." }),
  notes: optionalText(5000),
});

export type SurveyInput = z.infer<typeof SurveyInputSchema>;
