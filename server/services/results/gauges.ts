import type { SubmitResultBody } from '../../../shared/schemas/results.js';
import { AppError, invalid } from '../../errors.js';
import type { Gauge } from '../../models/index.js';
import { fitOf, gaugeChoices } from '../gauge-suitability.js';
import type { Reference } from '../reference-cache.js';
import { lower, type FormChar } from './common.js';
import type { ChosenGauges } from './submission.js';

/** The result's gauge, and any measured characteristic taken with another one: each usable now. */
export function chooseGauges(ref: Reference, chars: FormChar[], body: SubmitResultBody): ChosenGauges {
  const gauges = gaugeChoices(ref, chars);
  const usableGauge = (code: string, field: string) => {
    const g = gauges.byCode.get(code.toUpperCase()) ?? null;
    const choice = gauges.choices.find((x) => x.code === g?.code);
    if (!g || !choice) throw invalid('Choose a gauge from the list.', { [field]: `No gauge ${code}.` });
    if (!choice.usable)
      throw invalid(`${g.code} cannot be used: ${choice.why} Use another gauge.`, { [field]: choice.why });
    return g;
  };
  const gauge: Gauge | null = body.gauge ? usableGauge(body.gauge, 'gauge') : null;
  const gaugeOf = new Map<string, Gauge>();
  for (const [code, g] of Object.entries(body.gauges)) {
    const c = chars.find((x) => x.code === code);
    if (!c || c.kind !== 'variable') {
      throw invalid(`${code} is not measured at this stage.`, {
        [`gauges.${code}`]: 'Not a measured characteristic here.',
      });
    }
    gaugeOf.set(code, usableGauge(g, `gauges.${code}`));
  }
  // a gauge names the instrument a reading was taken with: none for a reading nobody took
  for (const code of gaugeOf.keys()) {
    if (!body.readings.some((r) => r.characteristic === code)) {
      const c = chars.find((x) => x.code === code)!;
      throw invalid(`No ${lower(c.name)} was entered: leave its gauge out.`, {
        [`gauges.${code}`]: `No ${lower(c.name)} reading was entered, so no gauge was used for it.`,
      });
    }
  }
  const unmeasured = chars.filter((c) => c.kind === 'variable' && !c.optional && !gaugeOf.has(c.code));
  if (!gauge && unmeasured.length) {
    throw invalid('Choose the gauge the readings were taken with.', { gauge: 'Choose the gauge used.' });
  }
  checkGaugeFit(ref, chars, body, { gauge, gaugeOf });
  return { gauge, gaugeOf };
}

/** Each measured characteristic read must be within what its gauge can measure (unit, range, resolution). */
function checkGaugeFit(ref: Reference, chars: FormChar[], body: SubmitResultBody, { gauge, gaugeOf }: ChosenGauges) {
  const unsuitable: Record<string, string> = {};
  for (const c of chars) {
    if (c.kind !== 'variable' || !body.readings.some((r) => r.characteristic === c.code)) continue;
    const g = gaugeOf.get(c.code) ?? gauge;
    if (!g) continue;
    const fit = fitOf(ref, g, c);
    if (!fit.ok) unsuitable[gaugeOf.has(c.code) ? `gauges.${c.code}` : 'gauge'] ??= fit.message;
  }
  const refused = Object.values(unsuitable);
  if (refused.length) {
    throw new AppError(
      'gauge_unsuitable',
      `${refused[0]} Choose a gauge that can measure it. Nothing was recorded.`,
      unsuitable,
    );
  }
}
