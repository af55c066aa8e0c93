/**
 * The path patterns of `forecast-files` and `hindcast-files`: the one place that knows the placeholders, fills
 * them in and finds the files a pattern matches. A placeholder may stand anywhere in the path, directories too.
 *
 * - `{date}`: YYYYMMDD of the forecast reference date (or of a hindcast start)
 * - `{year}`: the 4-digit year of a hindcast start; `{mmdd}`: its month and day, 4 digits
 * - `{var}`: the file's variable name of a quantity (`sources[].variables`), for one file per variable
 * - `{member}`: a member number, or a member group `first-last` (e.g. `00-09`), for one file per member or group
 *
 * Conventions of data portals (common practice, no source).
 */
import { existsSync, readdirSync } from 'node:fs';
import { join, sep } from 'node:path';

/** What each placeholder matches in a file or folder name. */
const PLACEHOLDER_PATTERNS = {
  date: '\\d{8}',
  year: '\\d{4}',
  mmdd: '\\d{4}',
  var: '[^/]+?',
  member: '\\d+(?:-\\d+)?',
} as const;

export type Placeholder = keyof typeof PLACEHOLDER_PATTERNS;
export type PlaceholderValues = Partial<Record<Placeholder, string>>;

export const PLACEHOLDERS = Object.keys(PLACEHOLDER_PATTERNS) as readonly Placeholder[];

const BRACED = /\{([^{}]*)\}/g;
const KNOWN = new RegExp(`\\{(${Object.keys(PLACEHOLDER_PATTERNS).join('|')})\\}`, 'g');

/** Every `{name}` of the pattern, in order of appearance, known or not. */
export function placeholdersIn(pattern: string): string[] {
  return [...pattern.matchAll(BRACED)].map((m) => m[1]);
}

/** The `{name}`s of the pattern that are not placeholders (a typo such as `{data}`), each once. */
export function unknownPlaceholders(pattern: string): string[] {
  return [...new Set(placeholdersIn(pattern).filter((p) => !PLACEHOLDERS.some((known) => known === p)))];
}

export function hasPlaceholder(pattern: string, name: Placeholder): boolean {
  return pattern.includes(`{${name}}`);
}

/** YYYYMMDD of an ISO date (YYYY-MM-DD), as `{date}` stands in paths. */
export function compactDate(isoDate: string): string {
  return isoDate.replaceAll('-', '');
}

/** The pattern with the placeholders given in `values` replaced (the others stay as they are). */
export function fillPattern(pattern: string, values: PlaceholderValues): string {
  let out = pattern;
  for (const name of PLACEHOLDERS) {
    const value = values[name];
    if (value !== undefined) out = out.replaceAll(`{${name}}`, value);
  }
  return out;
}

export interface PatternMatch {
  readonly path: string;
  /** The value each placeholder of the pattern took in this path. */
  readonly values: PlaceholderValues;
}

function escapeRegExp(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}

/** A regular expression for one path segment; a placeholder seen twice must take the same value (back-reference). */
function segmentRegExp(segment: string): RegExp {
  const seen = new Set<string>();
  let source = '';
  let last = 0;
  for (const m of segment.matchAll(KNOWN)) {
    source += escapeRegExp(segment.slice(last, m.index));
    const name = m[1] as Placeholder;
    source += seen.has(name) ? `\\k<${name}>` : `(?<${name}>${PLACEHOLDER_PATTERNS[name]})`;
    seen.add(name);
    last = (m.index ?? 0) + m[0].length;
  }
  return new RegExp(`^${source}${escapeRegExp(segment.slice(last))}$`);
}

function listFolder(dir: string): string[] {
  try {
    return readdirSync(dir).sort();
  } catch {
    return [];
  }
}

/**
 * Every existing path the pattern matches, its placeholders read back from the names; sorted by path. Unknown
 * `{names}` match themselves literally (`forelight check` reports them). Folders are listed only where a segment
 * holds a placeholder.
 */
export function matchPattern(pattern: string): PatternMatch[] {
  const segments = pattern.split(sep);
  let found: PatternMatch[] = [{ path: segments[0] === '' ? sep : segments[0], values: {} }];
  for (const segment of segments.slice(1)) {
    if (segment.search(KNOWN) < 0) {
      found = found.map((f) => ({ ...f, path: join(f.path, segment) }));
      continue;
    }
    const re = segmentRegExp(segment);
    const next: PatternMatch[] = [];
    for (const f of found) {
      for (const entry of listFolder(f.path)) {
        const m = re.exec(entry);
        if (!m) continue;
        const groups = m.groups ?? {};
        const values: Record<string, string> = { ...f.values };
        if (Object.entries(groups).some(([k, v]) => values[k] !== undefined && values[k] !== v)) continue;
        Object.assign(values, groups);
        next.push({ path: join(f.path, entry), values });
      }
    }
    found = next;
  }
  return found.filter((f) => existsSync(f.path)).sort((a, b) => a.path.localeCompare(b.path));
}
