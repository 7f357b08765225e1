// The map draws label glyphs in the browser from the page's own Noto Sans
// (shipped with the app through @fontsource). Glyphs drawn before the font has
// loaded would be cached in a fallback face, so the map waits for it.

const WEIGHTS = ['400', '600', '700'] as const;
// Latin and Latin Extended letters, so both font subsets are fetched.
const SAMPLE = 'Bearline 0123 ÅÉÑØ ĀāŁłŌőŠšŽž';

export async function loadLabelFonts(timeoutMs = 4000): Promise<void> {
  if (typeof document === 'undefined' || !('fonts' in document)) return;
  const loads = Promise.all(WEIGHTS.map((w) => document.fonts.load(`${w} 16px "Noto Sans"`, SAMPLE))).then(() => undefined);
  const timeout = new Promise<void>((resolve) => setTimeout(resolve, timeoutMs));
  await Promise.race([loads.catch(() => undefined), timeout]);
}
