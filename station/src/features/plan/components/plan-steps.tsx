import type { PlanResponse } from '@tareline/protocol';
import { formatImperialMass, formatMass, formatNumber, formatVolume } from '../utils/format';

type Row = { step: string; metric: string; imperial: string; strong?: boolean };

function rowsOf(plan: PlanResponse): Row[] {
  const rows: Row[] = [
    {
      step: 'Cavity',
      metric: formatVolume(plan.cavityVolumeCm3, 'cm3'),
      imperial: formatVolume(plan.cavityVolumeCm3, 'in3'),
    },
  ];
  if (plan.displacementCm3 > 0) {
    rows.push(
      {
        step: 'Minus the model',
        metric: formatVolume(plan.displacementCm3, 'cm3', '−'),
        imperial: formatVolume(plan.displacementCm3, 'in3', '−'),
      },
      {
        step: 'Net volume',
        metric: formatVolume(plan.netVolumeCm3, 'cm3'),
        imperial: formatVolume(plan.netVolumeCm3, 'in3'),
      },
    );
  }
  if (plan.overagePct > 0) {
    const extraCm3 = plan.fillVolumeCm3 - plan.netVolumeCm3;
    rows.push(
      {
        step: `Plus ${formatNumber(plan.overagePct, plan.overagePct % 1 ? 1 : 0)} % overage`,
        metric: formatVolume(extraCm3, 'cm3', '+'),
        imperial: formatVolume(extraCm3, 'in3', '+'),
      },
      {
        step: 'Volume to fill',
        metric: formatVolume(plan.fillVolumeCm3, 'cm3'),
        imperial: formatVolume(plan.fillVolumeCm3, 'in3'),
      },
    );
  }
  rows.push({
    step: `Mass at SG ${formatNumber(plan.specificGravity, 3)} (yield ${formatNumber(plan.yieldIn3PerLb, 2)} in³/lb)`,
    metric: formatMass(plan.fillMassG, 'g'),
    imperial: formatImperialMass(plan.fillMassG),
  });
  if (plan.cupLossG > 0) {
    rows.push({
      step: 'Plus cup loss',
      metric: formatMass(plan.cupLossG, 'g', '+'),
      imperial: formatImperialMass(plan.cupLossG, '+'),
    });
  }
  rows.push({
    step: 'Total to mix',
    metric: formatMass(plan.totalMassG, 'g'),
    imperial: formatImperialMass(plan.totalMassG),
    strong: true,
  });
  for (const part of plan.parts) {
    rows.push({
      step: `Part ${part.name} (${formatNumber(part.weightPart, part.weightPart % 1 ? 2 : 0)} by weight)`,
      metric: formatMass(part.massG, 'g'),
      imperial: formatImperialMass(part.massG),
      strong: true,
    });
  }
  return rows;
}

/** Each step of the arithmetic, metric and imperial side by side, so a lead can check it. */
export function PlanSteps({ plan }: { plan: PlanResponse }) {
  return (
    <div className="flex flex-col gap-4">
      <table className="w-full border-collapse text-lg">
        <caption className="pb-2 text-left text-xl font-bold">How the amount is worked out</caption>
        <thead>
          <tr className="border-b-2 border-line text-left text-muted">
            <th scope="col" className="py-2 pr-3 font-semibold">
              Step
            </th>
            <th scope="col" className="py-2 pr-3 text-right font-semibold">
              Metric
            </th>
            <th scope="col" className="py-2 text-right font-semibold">
              Imperial
            </th>
          </tr>
        </thead>
        <tbody>
          {rowsOf(plan).map((row) => (
            <tr
              key={row.step}
              className={`border-b border-line ${row.strong ? 'text-2xl font-bold' : ''}`}
            >
              <th scope="row" className="py-2 pr-3 text-left font-semibold">
                {row.step}
              </th>
              <td className="py-2 pr-3 text-right">{row.metric}</td>
              <td className="py-2 text-right">{row.imperial}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="text-base text-muted">
        Each part is weighed within ±
        {formatNumber(plan.tolerancePct, plan.tolerancePct % 1 ? 1 : 0)} %:{' '}
        {plan.parts
          .map((p) => `part ${p.name} ${formatNumber(p.lowG, 1)}–${formatNumber(p.highG, 1)} g`)
          .join(', ')}
        . At the bench, part B is set again from the part A actually poured.
        {plan.minNetWeightG !== undefined
          ? ` This scale weighs ${formatMass(plan.minNetWeightG, 'g')} or more within the band.`
          : ''}
      </p>
    </div>
  );
}
