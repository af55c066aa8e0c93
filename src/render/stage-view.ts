/**
 * The stage ladder as templates print it for one locale and audience: label, glyph, colours (with readable ink),
 * meaning and pre-agreed actions, the "no forecast available" state, and lookups by stage id.
 */
import type { StageConfig } from '../config/decision-config.ts';
import { ForelightError } from '../core/errors.ts';
import { NO_FORECAST_ID } from '../decide/types.ts';
import type { RenderConfig } from './model.ts';
import { applyTypography } from './typography.ts';

export interface StageView {
  readonly id: string;
  readonly rank: number;
  readonly label: string;
  readonly glyph: string;
  readonly colour: string;
  /** Text colour readable on `colour` (black or white, by WCAG relative luminance). */
  readonly ink: string;
  readonly meaning: string;
  readonly actions: string;
}

/** Text of a per-locale record (with the locale's typography), or a one-line render error naming what is missing. */
export function pickLocale(record: Readonly<Record<string, string>> | undefined, locale: string, what: string): string {
  const text = record?.[locale];
  if (text === undefined || text.trim() === '') {
    throw new ForelightError(
      'render',
      'missing-translation',
      `${what} has no text for locale "${locale}"`,
      `add a "${locale}" entry for it in the config YAML`,
    );
  }
  return applyTypography(locale, text);
}

/** Stage ladder lookups for one config. */
export function stageIndex(config: RenderConfig): (id: string) => { stage: StageConfig; rank: number } {
  const byId = new Map(config.stages.map((stage, rank) => [stage.id, { stage, rank }]));
  return (id) => {
    const hit = byId.get(id);
    if (!hit)
      throw new ForelightError(
        'render',
        'unknown-stage',
        `stage "${id}" is not in the configured ladder (${[...byId.keys()].join(', ')})`,
        'check the decide stage output against config stages',
      );
    return hit;
  };
}

/**
 * The "no forecast available" state (decide's NO_FORECAST_ID): its own glyph (U+2298 CIRCLED DIVISION SLASH) and a
 * neutral grey that is no stage colour (`forelight check` refuses a ladder colour equal to it); rank -1, below
 * every stage, so it never reads as the lowest stage. Its words are the catalogue's noForecast.* messages.
 */
export const NO_FORECAST_GLYPH = '⊘';
export const NO_FORECAST_COLOUR = '#d0d0d0';

export function noForecastView(t: (key: string) => string): StageView {
  return {
    id: NO_FORECAST_ID,
    rank: -1,
    label: t('noForecast.label'),
    glyph: NO_FORECAST_GLYPH,
    colour: NO_FORECAST_COLOUR,
    ink: inkFor(NO_FORECAST_COLOUR),
    meaning: t('noForecast.meaning'),
    actions: t('noForecast.actions'),
  };
}

/** Label, glyph, meaning and the pre-agreed actions of `audience` (team id, else "default"). */
export function toStageView(stage: StageConfig, rank: number, locale: string, audience: string): StageView {
  const actions = stage.actions[audience]?.[locale] !== undefined ? stage.actions[audience] : stage.actions.default;
  return {
    id: stage.id,
    rank,
    label: pickLocale(stage.label, locale, `stage "${stage.id}" label`),
    glyph: stage.glyph,
    colour: stage.colour,
    ink: inkFor(stage.colour),
    meaning: pickLocale(stage.meaning, locale, `stage "${stage.id}" meaning`),
    actions: pickLocale(actions, locale, `stage "${stage.id}" actions for "${audience}" (or default)`),
  };
}

/** Black or white, whichever contrasts more with a `#rrggbb` background (WCAG 2.1 relative luminance). */
export function inkFor(colour: string): string {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(colour);
  if (!m) return '#000000';
  const lin = (h: string): number => {
    const c = parseInt(h, 16) / 255;
    return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  };
  const l = 0.2126 * lin(m[1]) + 0.7152 * lin(m[2]) + 0.0722 * lin(m[3]);
  return 1.05 / (l + 0.05) >= (l + 0.05) / 0.05 ? '#ffffff' : '#000000';
}
