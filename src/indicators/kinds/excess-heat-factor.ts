/**
 * Indicator kind excess-heat-factor: EHF = EHI_sig × max(1, EHI_accl) from DMT = (Tmax_i + Tmin_i+1)/2, with T95
 * from the climatology; `output: severity-ratio` gives EHF/EHF85 instead (Nairn & Fawcett 2015).
 */
import { defineIndicator, paramsSchema } from '../definition.ts';
import { ehfSeverityRatio, excessHeatFactorSeries } from '../excess-heat-factor-nairn-fawcett-2015.ts';
import { badParam, missingClimatology } from '../kind-inputs.ts';
import { checkAligned, requireQuantity } from '../series-checks.ts';

export type ExcessHeatFactorParams = { readonly output?: 'ehf' | 'severity-ratio' };

export const definition = defineIndicator<'excess-heat-factor', ExcessHeatFactorParams>({
  kind: 'excess-heat-factor',
  units: 'degC2',
  needs: [['tmax'], ['tmin']],
  params: paramsSchema({
    output: { enum: ['ehf', 'severity-ratio'], default: 'ehf', description: 'EHF in degC2, or the severity ratio EHF/EHF85.' },
  }),
  describe: {
    name: 'Excess Heat Factor',
    description: 'Significance of the 3-day mean against T95 times acclimatisation against the previous 30 days; NaN on the last 3 days.',
    references: ['nairnFawcett2015'],
  },
  compute(ind, inputs, context) {
    const tmax = requireQuantity(inputs, 'tmax', ind.id, 'DMT = (Tmax_i + Tmin_i+1)/2');
    const tmin = requireQuantity(inputs, 'tmin', ind.id, 'DMT = (Tmax_i + Tmin_i+1)/2');
    checkAligned([tmax, tmin]);
    const t95 = context.climatology?.dmtP95C;
    if (t95 === undefined) throw missingClimatology(ind, tmax.region, 'T95 of daily mean temperature (dmtP95C)');
    const output = ind.params.output ?? 'ehf';
    if (output !== 'ehf' && output !== 'severity-ratio')
      throw badParam(ind, `params.output is "${String(output)}"`, 'use ehf or severity-ratio');
    const ehf85 = context.climatology?.ehf85;
    if (output === 'severity-ratio' && !(ehf85 !== undefined && ehf85 > 0)) throw missingClimatology(ind, tmax.region, 'positive EHF85');
    const data = new Float64Array(tmax.data.length);
    const notes: string[] = [];
    const { partialAcclimatisationDays } = excessHeatFactorSeries(
      tmax.data,
      tmin.data,
      tmax.members,
      tmax.days.length,
      t95,
      context.antecedentDmtC,
      data,
    );
    if (partialAcclimatisationDays > 0) {
      notes.push(
        `EHF acclimatisation (30-day mean) rests on fewer than 30 analysed days for ${partialAcclimatisationDays / tmax.members} lead day(s): give antecedentDmtC`,
      );
    }
    notes.push("EHF is NaN on the last 3 days (needs the next morning's Tmin and a 3-day forward window)");
    if (output === 'severity-ratio') for (let i = 0; i < data.length; i++) data[i] = ehfSeverityRatio(data[i], ehf85 as number); // checked > 0 above
    return { template: tmax, data, outOfRange: 0, notes };
  },
});
