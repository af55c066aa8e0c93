/**
 * Keys of maps and JSON records that stand for a combination of ids: region × indicator (model climates,
 * forecast leads, observed indicators), region × indicator × tier (stage tracks, source combination) and
 * region × rule (tuned cost/loss thresholds). Ids match the configuration schema's `$defs/id` pattern
 * `^[a-z0-9]+(-[a-z0-9]+)*$`, so '|' never occurs inside one and a key splits back unambiguously.
 * Each key kind is its own type: a track key cannot be used where a region × indicator key is meant.
 */
declare const kind: unique symbol;
type Key<K extends string> = string & { readonly [kind]: K };

export type PairKey = Key<'region|indicator'>;
export type TrackKey = Key<'region|indicator|tier'>;
export type TunedKey = Key<'region|rule'>;
export type EventKey = Key<'region|indicator|tier|lead'>;

const join = <K extends string>(...ids: readonly (string | number)[]): Key<K> => ids.join('|') as Key<K>;

/** Key of one region × indicator. */
export const pairKey = (region: string, indicator: string): PairKey => join(region, indicator);

/** The region and indicator of a `pairKey`. */
export function pairOf(key: PairKey): { readonly region: string; readonly indicator: string } {
  const [region, indicator] = key.split('|');
  return { region, indicator };
}

/** Key of one region × indicator × lead-time tier (a stage track). */
export const trackKey = (region: string, indicator: string, tier: string): TrackKey => join(region, indicator, tier);

/** Key of one lead of a stage track (a backtest's observed event). */
export const eventKey = (region: string, indicator: string, tier: string, leadIndex: number): EventKey =>
  join(region, indicator, tier, leadIndex);

/** Key of a cost/loss threshold tuned for one region and rule (the tuning is per region: its own hindcasts). */
export const tunedKey = (region: string, ruleId: string): TunedKey => join(region, ruleId);
