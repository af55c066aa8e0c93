/** One range (days, weeks or months) of one hazard of a region, as templates print it (built in region-view.ts). */
import type { Tier } from '../types.ts';
import type { StageView } from './stage-view.ts';
import type { LeadGroup, LeadView } from './view-model.ts';

export interface TierView {
  readonly tier: Tier;
  readonly tierName: string;
  readonly indicatorId: string;
  readonly hazard: string;
  readonly stage: StageView;
  readonly deciding: LeadView | null;
  readonly leads: readonly LeadView[];
  readonly groups: readonly LeadGroup[];
  /** Threshold in plain words ("34.2 °C", "heatwave conditions"), as a range when the leads shown differ. */
  readonly threshold: string;
  /** Lowest and highest threshold value over the leads (NaN without leads). */
  readonly thresholdRange: { readonly low: number; readonly high: number };
  /** Why the stage of this range is not the one its rows point to ('' when it is): kept higher, or data missing. */
  readonly note: string;
  /** Technical note: how the threshold was set and the skill figures of this tier. */
  readonly method: readonly string[];
}
