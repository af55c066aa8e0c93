/**
 * `run.json`: the full numbers of a run for downstream systems. Shape (schema id `forelight-run/2`):
 *
 * {
 *   schema: "forelight-run/2", runId, issuedAt, mode: "live"|"exercise", nextIssue: "YYYY-MM-DD",
 *   forecastDates: [{ source, name, referenceTime, basedOnOlder }],
 *   notes: [string]                                                    // source-combination rule and what it replaced
 *   problems: [Diagnostic]                                             // inputs left out, bulletin contradictions: { code, severity, stage,
 *                                                                      //   place: { file, source, region, variable,
 *                                                                      //   indicator, ... }, message, hint }
 *   stages: [{ id, label: {locale: text}, glyph, colour }]            // the ladder, lowest first
 *   indicators: [{ id, name, kind, trendClimate: boolean,                // climate detrended, re-centred on the issue year
 *     regionValue: { weights: "area"|"population", shareAbove: number|null,   // share-above: values are % of the
 *                    populationRaster: path|null } }]                         //   region's area or people above it
 *   regions: [{
 *     id, name, stageId, previousStageId, changeReason,
 *     tiers: [{
 *       tier, indicator: { id, name, units },
 *       decision: StageDecision,                                       // as from decide, `lead` in full
 *       probabilities: LeadProbability[]                               // every field, incl. threshold and skill;
 *                                                                      //   climateTrend: { onYear, firstYear, lastYear,
 *                                                                      //   hindcast, observed: { perDecade,
 *                                                                      //   standardErrorPerDecade, criticalT, applied }
 *                                                                      //   or null, units }
 *     }]
 *   }],
 *   capAlerts: [{ id, region, indicator, msgType, stageId }]
 * }
 *
 * Numbers are plain JSON numbers (fractions 0..1 for probabilities); NaN and infinities become null.
 */
import { NO_FORECAST_ID } from '../decide/types.ts';
import type { BulletinRun, CapAlert, RenderConfig } from './model.ts';

export const RUN_JSON_SCHEMA = 'forelight-run/2';

/** Serialise a run (2-space indented, stable key order). */
export function renderRunJson(config: RenderConfig, run: BulletinRun, capAlerts: readonly CapAlert[]): string {
  const doc = {
    schema: RUN_JSON_SCHEMA,
    runId: run.runId,
    issuedAt: run.issuedAt,
    mode: run.mode,
    nextIssue: run.nextIssue,
    forecastDates: run.forecastDates.map((f) => ({
      source: f.source,
      name: f.name,
      referenceTime: f.referenceTime,
      basedOnOlder: f.basedOnOlder ?? false,
    })),
    notes: run.notes ?? [],
    problems: run.problems ?? [],
    stages: config.stages.map((s) => ({ id: s.id, label: s.label, glyph: s.glyph, colour: s.colour })),
    indicators: config.indicators.map((i) => {
      const weights = i.regionValue?.weights ?? 'area';
      return {
        id: i.id,
        name: i.name,
        kind: i.kind,
        trendClimate: i.trendClimate,
        regionValue: {
          weights,
          shareAbove: i.regionValue?.shareAbove ?? null,
          populationRaster: weights === 'population' ? (config.population?.file ?? null) : null,
        },
      };
    }),
    regions: run.regions.map((r) => ({
      id: r.region.id,
      name: r.region.name,
      stageId: r.stage?.id ?? NO_FORECAST_ID,
      previousStageId: r.previousStageId,
      changeReason: r.changeReason,
      tiers: r.perTier.map((t) => ({ tier: t.tier, indicator: t.indicator, decision: t.decision, probabilities: t.probabilities })),
    })),
    capAlerts: capAlerts.map((a) => ({ id: a.id, region: a.region, indicator: a.indicator, msgType: a.msgType, stageId: a.stageId })),
  };
  return `${JSON.stringify(doc, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`;
}
