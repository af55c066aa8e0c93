/**
 * The small stage timeline of a region's archive page: one step per issued bulletin, the ladder on the y axis
 * (glyph + label), each marker the stage's colour with its glyph, so it reads in black and white too.
 */
import { escapeXml } from './safe-text.ts';

export interface TimelinePoint {
  readonly date: string;
  readonly rank: number;
  readonly glyph: string;
  readonly colour: string;
  readonly ink: string;
}

export const TIMELINE_WIDTH = 360;
const LEFT = 112;
const RIGHT = 14;
const ROW = 26;
const TOP = 12;

/** SVG of the timeline; `ladder` lowest first. Dates are shown for the first, the last and at most every fourth point. */
export function renderTimelineSvg(
  points: readonly TimelinePoint[],
  ladder: readonly { glyph: string; label: string }[],
  title: string,
): string {
  // A run with no forecast for the region (rank -1, below every stage) gets its own row under the ladder.
  const rows = ladder.length + (points.some((p) => p.rank < 0) ? 1 : 0);
  const height = TOP + rows * ROW + 34;
  const y = (rank: number): number => TOP + (ladder.length - 1 - rank) * ROW + ROW / 2;
  const span = TIMELINE_WIDTH - LEFT - RIGHT;
  const x = (i: number): number => (points.length <= 1 ? LEFT + span / 2 : LEFT + (span * i) / (points.length - 1));
  const every = Math.max(1, Math.ceil(points.length / 4));
  const out: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${TIMELINE_WIDTH}" height="${height}" viewBox="0 0 ${TIMELINE_WIDTH} ${height}" role="img" font-family="'DejaVu Sans', Verdana, Arial, sans-serif">`,
    `<title>${escapeXml(title)}</title>`,
    `<rect width="${TIMELINE_WIDTH}" height="${height}" fill="#ffffff"/>`,
  ];
  ladder.forEach((s, rank) => {
    out.push(`<line x1="${LEFT}" x2="${TIMELINE_WIDTH - RIGHT}" y1="${y(rank)}" y2="${y(rank)}" stroke="#e2e2e2"/>`);
    out.push(
      `<text x="${LEFT - 8}" y="${y(rank) + 4}" text-anchor="end" font-size="11" fill="#222" class="tick">${escapeXml(`${s.glyph} ${s.label}`)}</text>`,
    );
  });
  if (points.length > 1)
    out.push(
      `<path d="${points.map((p, i) => `${i === 0 ? 'M' : 'H'}${x(i).toFixed(1)}${i === 0 ? ` ${y(p.rank)}` : ` V${y(p.rank)}`}`).join(' ')}" fill="none" stroke="#4d004b" stroke-width="1.6"/>`,
    );
  points.forEach((p, i) => {
    out.push(`<circle cx="${x(i).toFixed(1)}" cy="${y(p.rank)}" r="8" fill="${p.colour}" stroke="#333"/>`);
    out.push(
      `<text x="${x(i).toFixed(1)}" y="${y(p.rank) + 4}" text-anchor="middle" font-size="11" fill="${p.ink}">${escapeXml(p.glyph)}</text>`,
    );
    if (i === 0 || i === points.length - 1 || i % every === 0) {
      const anchor = points.length > 1 && i === 0 ? 'start' : points.length > 1 && i === points.length - 1 ? 'end' : 'middle';
      const near = i !== 0 && i !== points.length - 1 && points.length - 1 - i < every / 2;
      if (!near)
        out.push(
          `<text x="${x(i).toFixed(1)}" y="${height - 10}" text-anchor="${anchor}" font-size="11" fill="#333" class="tick">${escapeXml(p.date)}</text>`,
        );
    }
  });
  out.push('</svg>');
  return out.join('\n');
}
