// In the browser a face can be late (font-display: swap): until it arrives, and for any character outside the
// subset WOFF2 (scripts/web/fonts.ts), text is set in the nearest system face of the same kind instead of the
// browser's default serif.
const FALLBACK = {
  sans: 'system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif',
  slab: 'Rockwell, "Roboto Slab", "DejaVu Serif", Georgia, serif',
} as const;

export function withFallback(face: string, fallback: keyof typeof FALLBACK): string {
  return `${face}, ${FALLBACK[fallback]}`;
}
