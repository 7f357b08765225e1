// Default operator colours, in the order new operators take them: the Okabe–Ito palette, chosen to
// stay distinguishable with the common colour-vision deficiencies (Okabe & Ito, "Color Universal
// Design", 2008). Admins may pick any colour. No schema library here, so the admin page loads little.
export const OPERATOR_PALETTE = ['#0072b2', '#e69f00', '#009e73', '#cc79a7', '#d55e00', '#56b4e9', '#f0e442', '#000000'] as const;

/** The first palette colour no operator uses yet (the palette repeats when all are taken). */
export function pickDefaultColour(used: readonly string[]): string {
  const taken = new Set(used.map((c) => c.toLowerCase()));
  return OPERATOR_PALETTE.find((c) => !taken.has(c)) ?? OPERATOR_PALETTE[used.length % OPERATOR_PALETTE.length]!;
}
