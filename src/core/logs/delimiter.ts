/** Delimiter of a log from its header line: the most frequent of tab, comma, semicolon, pipe; else runs of whitespace. */
export type Delimiter = "," | "\t" | ";" | "|" | "whitespace";

const CANDIDATES: readonly Exclude<Delimiter, "whitespace">[] = ["\t", ",", ";", "|"];

export function detectDelimiter(headerLine: string): Delimiter {
  let best: Delimiter | null = null;
  let bestCount = 0;
  for (const c of CANDIDATES) {
    let count = 0;
    let inQuotes = false;
    for (let i = 0; i < headerLine.length; i++) {
      const ch = headerLine[i];
      if (ch === '"') inQuotes = !inQuotes;
      else if (ch === c && !inQuotes) count++;
    }
    if (count > bestCount) {
      best = c;
      bestCount = count;
    }
  }
  if (best) return best;
  return /\S\s+\S/.test(headerLine.trim()) ? "whitespace" : ",";
}

/** Human name of a delimiter, for messages and results. */
export function delimiterName(d: Delimiter): string {
  return d === "\t" ? "tab" : d === "," ? "comma" : d === ";" ? "semicolon" : d === "|" ? "pipe" : "whitespace";
}
