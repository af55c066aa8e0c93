/**
 * Indicator kind malaria-suitability: monthly climate suitability for Plasmodium transmission (fuzzy AND of one
 * temperature term, by default Craig et al. 1999, and the Craig rainfall membership), put on every day of the month it speaks for
 * (data month + lag-months; in a model calendar the model month, src/read/DECISIONS.md §3). Parameters and defaults:
 * parseMalariaParams (malaria-monthly.ts).
 */
import { modelMonthDays } from '../../core/calendar-days.ts';
import { datesOfMonth } from '../../core/iso-dates.ts';
import { defineIndicator, paramsSchema } from '../definition.ts';
import { meanTemperature } from '../kind-inputs.ts';
import { MALARIA_TEMPERATURE_MODELS, monthlySuitability, parseMalariaParams, type MalariaTemperatureModel } from '../malaria-monthly.ts';
import { checkAligned, requireQuantity } from '../series-checks.ts';

export type MalariaSuitabilityParams = {
  readonly species?: 'falciparum' | 'vivax' | 'P. falciparum' | 'P. vivax';
  readonly temperatureModel?: MalariaTemperatureModel;
  readonly lagMonths?: 1 | 2;
  readonly minMonthCoverage?: number;
  readonly marginalAt?: number;
  readonly suitableAt?: number;
};

const DEFAULTS = parseMalariaParams({ id: 'defaults', params: {} });
const fraction = (what: string, dflt: number) => ({ type: 'number', minimum: 0, maximum: 1, default: dflt, description: what });

export const definition = defineIndicator<'malaria-suitability', MalariaSuitabilityParams>({
  kind: 'malaria-suitability',
  units: '1',
  needs: [['tmean', 'tmax'], ['tmean', 'tmin'], ['precip']],
  params: paramsSchema({
    species: {
      enum: ['falciparum', 'vivax', 'P. falciparum', 'P. vivax'],
      default: DEFAULTS.species,
      description: 'Plasmodium species (sporogony constants).',
    },
    'temperature-model': {
      enum: [...MALARIA_TEMPERATURE_MODELS],
      default: DEFAULTS.temperatureModel,
      description:
        'The one temperature term: Craig membership, or instead survival through sporogony (Martens, Detinova) or relative R0 (Mordecai, P. falciparum only).',
    },
    'lag-months': { enum: [1, 2], default: DEFAULTS.lagMonths, description: 'Months from the weather to the transmission it shapes.' },
    'min-month-coverage': fraction('Fraction of a month the forecast must cover for an index.', DEFAULTS.minMonthCoverage),
    'marginal-at': fraction('Index from which a month is marginal.', DEFAULTS.marginalAt),
    'suitable-at': fraction('Index from which a month is suitable.', DEFAULTS.suitableAt),
  }),
  checkParams: (ind) => void parseMalariaParams(ind),
  describe: {
    name: 'Malaria climate suitability',
    description:
      'Monthly index 0..1: min(temperature term, Craig rainfall membership); the temperature term is the Craig membership unless temperature-model names another (never both). Lagged by lag-months.',
    references: ['craigSnowLeSueur1999', 'martens1997', 'detinova1962', 'mordecai2013'],
  },
  compute(ind, inputs) {
    const notes: string[] = [];
    const p = parseMalariaParams(ind);
    const t = meanTemperature(ind, inputs, notes);
    const pr = requireQuantity(inputs, 'precip', ind.id, 'monthly rainfall for the Craig membership');
    checkAligned([t, pr]);
    const model = t.modelCalendar;
    const months = monthlySuitability(t.days, t.members, t.data, pr.data, p, { modelCalendar: model }).filter((mo) => {
      const ok = mo.forecastDays / mo.daysInMonth >= p.minMonthCoverage;
      if (!ok)
        notes.push(`month ${mo.dataMonth} has forecast for ${mo.forecastDays} of ${mo.daysInMonth} days: no index for ${mo.targetMonth}`);
      return ok;
    });
    // The target month's days: real dates, and in a model calendar the real dates of that model month's days.
    const targets = months.map((mo) =>
      model ? modelMonthDays(model, t.days[0], mo.targetMonth) : { real: datesOfMonth(mo.targetMonth), model: [] },
    );
    const days = targets.flatMap((d) => d.real);
    const data = new Float64Array(t.members * days.length);
    let col = 0;
    months.forEach((mo, k) => {
      const n = targets[k].real.length;
      for (let m = 0; m < t.members; m++) data.fill(mo.index[m], m * days.length + col, m * days.length + col + n);
      col += n;
    });
    notes.push(`monthly index (month + ${p.lagMonths} lag) repeated on every day of the month it speaks for`);
    const modelCalendar = model ? { modelCalendar: { calendar: model.calendar, days: targets.flatMap((d) => d.model) } } : {};
    return { template: t, data, outOfRange: 0, notes, days, ...modelCalendar };
  },
});
