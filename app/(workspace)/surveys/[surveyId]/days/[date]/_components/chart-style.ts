/**
 * Chart colours and the residual colour scale (ours). Raw, corrected and residual differ in hue
 * family (blue-grey, teal, amber) and in line style, so they read apart for colour-blind users.
 */
export const SERIES = {
  base: "#212b39", // ink-800
  fallbackBase: "#5b7fb0", // a lighter blue, dotted: the second base where it fills gaps
  raw: "#6b7f99", // ink-400, dashed
  corrected: "#0f665d", // tide-700
  residual: "#c2740a", // flare-600
  datum: "#861f22", // storm-700
} as const;

export const QA_FILL: Record<string, { fill: string; label: string }> = {
  gap: { fill: "#9aaabf", label: "Base gap" },
  change: { fill: "#c23a3a", label: "Large change in 60 s" },
  chord: { fill: "#e89410", label: "Chord deviation over limit" },
  noise: { fill: "#7fd3c6", label: "Fourth-difference noise over limit" },
  spike: { fill: "#a42a2a", label: "Spike (Hampel)" },
};

/** Diverging stops from negative (deep blue) through a warm white to positive (deep red-brown). */
const STOPS: [number, [number, number, number]][] = [
  [-1, [31, 78, 140]],
  [-0.5, [127, 167, 212]],
  [0, [243, 239, 228]],
  [0.5, [224, 153, 107]],
  [1, [142, 42, 30]],
];

/** Colour of `valueNt` on a symmetric scale ±limitNt (clipped at the ends). */
export function divergingColour(valueNt: number, limitNt: number): string {
  const x = Math.max(-1, Math.min(1, limitNt > 0 ? valueNt / limitNt : 0));
  for (let k = 1; k < STOPS.length; k++) {
    const [x1, c1] = STOPS[k];
    if (x <= x1) {
      const [x0, c0] = STOPS[k - 1];
      const f = (x - x0) / (x1 - x0);
      const c = c0.map((v, i) => Math.round(v + (c1[i] - v) * f));
      return `rgb(${c[0]},${c[1]},${c[2]})`;
    }
  }
  return "rgb(142,42,30)";
}

export const DIVERGING_GRADIENT = `linear-gradient(to right, ${STOPS.map(([x]) => `${divergingColour(x, 1)} ${((x + 1) / 2) * 100}%`).join(", ")})`;
