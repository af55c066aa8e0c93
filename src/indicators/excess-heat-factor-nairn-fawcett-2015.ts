/**
 * Excess Heat Factor, Nairn & Fawcett (2015) [nairnFawcett2015], eqs. 1-3:
 *
 *     DMT_i   = (Tmax_i + Tmin_(i+1)) / 2             daily mean over a 9 am-9 am day (Tmin of the NEXT morning)
 *     T3(i)   = (DMT_i + DMT_(i+1) + DMT_(i+2)) / 3   forward window (Nairn et al. 2018 [nairnOstendorfBi2018], appendix)
 *     T30(i)  = mean(DMT_(i-30) .. DMT_(i-1))         the 30 days before day i
 *     EHIsig  = T3 − T95,  EHIaccl = T3 − T30,  EHF = EHIsig · max(1, EHIaccl)   [°C²], assigned to day i
 *
 * T95 = 95th percentile of DMT over the climate reference period (see percentile.ts, numpy 'linear').
 * Negative EHF is kept (not clipped to 0): it measures how far below heatwave conditions a day is, and the
 * ensemble probability P(EHF > 0) is unaffected. Severity: EHF/EHF85 with EHF85 the 85th percentile of positive
 * EHF in the reference period; cut-offs <1 low-intensity, 1..<3 severe, ≥3 extreme are FROM MEMORY of the paper.
 * Temperatures °C; valid range: any finite temperature (range checks are done on the input series).
 */

/** DMT_i [°C] from Tmax of day i and Tmin of day i+1. */
export function dailyMeanTemperatureDmtC(tmaxDayC: number, tminNextDayC: number): number {
  return (tmaxDayC + tminNextDayC) / 2;
}

/** EHF [°C²] from the 3-day mean T3, the climatological T95 and the preceding 30-day mean T30 (all °C). */
export function excessHeatFactorNairnFawcett2015(t3C: number, t95C: number, t30C: number): number {
  return (t3C - t95C) * Math.max(1, t3C - t30C);
}

/** EHF [°C²] from the 30 DMT values before day i, the DMT of days i..i+2 and T95. */
export function excessHeatFactorFromDmt(prev30C: ArrayLike<number>, next3C: ArrayLike<number>, t95C: number): number {
  if (prev30C.length !== 30 || next3C.length !== 3) throw new RangeError('EHF needs exactly 30 prior and 3 forward DMT values');
  let s30 = 0;
  for (let k = 0; k < 30; k++) s30 += prev30C[k];
  return excessHeatFactorNairnFawcett2015((next3C[0] + next3C[1] + next3C[2]) / 3, t95C, s30 / 30);
}

/** Severity ratio EHF/EHF85 (dimensionless). */
export function ehfSeverityRatio(ehf: number, ehf85: number): number {
  return ehf / ehf85;
}

export type EhfSeverity = 'none' | 'low-intensity' | 'severe' | 'extreme';

/** Category of a day from EHF and its severity ratio (cut-offs 1 and 3 from memory of Nairn & Fawcett 2015). */
export function ehfSeverityCategory(ehf: number, ratio: number): EhfSeverity {
  if (!(ehf > 0)) return 'none';
  if (ratio < 1) return 'low-intensity';
  return ratio < 3 ? 'severe' : 'extreme';
}

export interface EhfSeriesCounts {
  /** Days (per member) whose T30 rested on fewer than 30 prior DMT values. */
  readonly partialAcclimatisationDays: number;
}

/**
 * EHF for every member and day of member-major Tmax/Tmin series (`steps` days each), written to `out`.
 * `antecedentDmtC`: analysed DMT of the days before lead day 1 (last element = the day before lead day 1),
 * up to 30 are used; with fewer, T30 averages what is available (antecedent + earlier forecast days) and the day
 * is counted as partial; with none at all on lead day 1, EHIaccl is unknown and the factor max(1, ·) is taken
 * as 1 (EHF = EHIsig). The last 3 days are NaN (no Tmin of the following morning / no full forward window).
 */
export function excessHeatFactorSeries(
  tmaxC: Float64Array,
  tminC: Float64Array,
  members: number,
  steps: number,
  t95C: number,
  antecedentDmtC: Float64Array | undefined,
  out: Float64Array,
): EhfSeriesCounts {
  const ante = antecedentDmtC ? antecedentDmtC.subarray(Math.max(0, antecedentDmtC.length - 30)) : new Float64Array(0);
  const a = ante.length;
  const dmt = new Float64Array(a + Math.max(0, steps - 1));
  dmt.set(ante);
  let partial = 0;
  for (let m = 0; m < members; m++) {
    const row = m * steps;
    for (let i = 0; i + 1 < steps; i++) dmt[a + i] = dailyMeanTemperatureDmtC(tmaxC[row + i], tminC[row + i + 1]);
    for (let i = 0; i < steps; i++) {
      if (i + 3 >= steps) {
        out[row + i] = NaN;
        continue;
      }
      const j = a + i;
      const t3 = (dmt[j] + dmt[j + 1] + dmt[j + 2]) / 3;
      const from = Math.max(0, j - 30);
      let s30 = 0;
      for (let k = from; k < j; k++) s30 += dmt[k];
      const n30 = j - from;
      if (n30 < 30) partial++;
      out[row + i] = n30 === 0 ? t3 - t95C : excessHeatFactorNairnFawcett2015(t3, t95C, s30 / n30);
    }
  }
  return { partialAcclimatisationDays: partial };
}
