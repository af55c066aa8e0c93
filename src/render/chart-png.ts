/** PNG copies of the SVG charts for e-mail, from resvg with the system DejaVu Sans font, within a size budget. */
import { Resvg } from '@resvg/resvg-js';

/** PNG (`zoom` × the SVG size; 2 for sharp phone display) rendered with system fonts, DejaVu Sans by default. */
export function renderChartPng(svg: string, zoom = 2): Uint8Array {
  const resvg = new Resvg(svg, {
    fitTo: { mode: 'zoom', value: zoom },
    font: { loadSystemFonts: true, defaultFontFamily: 'DejaVu Sans' },
  });
  return new Uint8Array(resvg.render().asPng());
}

/** Zoom levels tried, sharpest first, until an e-mail's charts fit its size budget. */
export const PNG_ZOOMS = [2, 1.5, 1] as const;

/**
 * PNGs of `svgs` at the sharpest zoom whose total stays within `budgetBytes` (1× when even that does not fit:
 * charts are never dropped, the caller's budget test then fails loudly).
 */
export function chartPngsWithin(
  svgs: readonly string[],
  budgetBytes: number,
  render: (svg: string, zoom: number) => Uint8Array = renderChartPng,
): { pngs: Uint8Array[]; zoom: number } {
  let last: { pngs: Uint8Array[]; zoom: number } = { pngs: [], zoom: PNG_ZOOMS[0] };
  for (const zoom of PNG_ZOOMS) {
    const pngs = svgs.map((svg) => render(svg, zoom));
    last = { pngs, zoom };
    if (pngs.reduce((n, p) => n + p.length, 0) <= budgetBytes) break;
  }
  return last;
}
