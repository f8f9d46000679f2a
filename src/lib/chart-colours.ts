// Chart colours that stay apart for colour-blind readers: the Okabe–Ito categorical palette
// (Okabe & Ito 2008) for series, and a single-hue sequential scale in our sea teal for
// heatmaps, light to dark, so order reads from lightness alone.

/** Okabe–Ito, black first left out (kept for text): orange, sky blue, bluish green, yellow, blue, vermillion, reddish purple. */
export const OKABE_ITO = ["#E69F00", "#56B4E9", "#009E73", "#F0E442", "#0072B2", "#D55E00", "#CC79A7"] as const;

/** The i-th series colour, cycling through the palette. */
export function seriesColour(i: number): string {
  return OKABE_ITO[((i % OKABE_ITO.length) + OKABE_ITO.length) % OKABE_ITO.length];
}

// Stops from paper-light to deep sea; lightness falls monotonically.
const STOPS: ReadonlyArray<[number, number, number]> = [
  [0xf4, 0xf2, 0xec],
  [0xa9, 0xd8, 0xd4],
  [0x3f, 0x9e, 0x99],
  [0x0b, 0x5d, 0x5f],
  [0x08, 0x2a, 0x3a],
];

/** Sequential fill for t in [0, 1] (clamped), with the text colour that reads on it. */
export function sequentialColour(t: number): { fill: string; text: string } {
  const x = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0)) * (STOPS.length - 1);
  const i = Math.min(STOPS.length - 2, Math.floor(x));
  const f = x - i;
  const rgb = STOPS[i].map((c, k) => Math.round(c + (STOPS[i + 1][k] - c) * f));
  // Ink or white, whichever contrasts more (WCAG relative luminance; the crossover is near 0.18).
  const lin = rgb.map((c) => (c / 255 <= 0.04045 ? c / 255 / 12.92 : ((c / 255 + 0.055) / 1.055) ** 2.4));
  const luminance = 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2];
  return { fill: `rgb(${rgb.join(" ")})`, text: luminance < 0.18 ? "#ffffff" : "#0c1a26" };
}
