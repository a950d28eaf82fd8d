import type { Batch } from '@tareline/protocol';
import { QRCodeSVG } from 'qrcode.react';
import { formatClock } from '../../../../lib/countdown';
import { gramsText } from '../../../../lib/grams';
import { partLetter } from '../../../../lib/parts';
import { deviationPctText } from '../../../../lib/percent';
import { VerdictMark } from './verdict-mark';

export interface CupLabelProps {
  batch: Batch;
  /** The address of the batch's page, which the QR code carries. */
  url: string;
  /** End of the pot life, or null when none is on file. */
  useBy: Date | null;
}

/**
 * The label for the cup, as shown on screen and as printed: index.css prints only what is marked
 * `data-print="label"`. Black on white whatever the theme, for a monochrome label printer.
 */
export function CupLabel({ batch, url, useBy }: CupLabelProps) {
  // One row a part, its lot under it in smaller type: three parts with long lot codes still fit
  // the 62 × 100 mm label.
  const parts = batch.parts.map((part, i) => ({
    name: partLetter(i),
    label: part.label,
    grams: part.actualG === null ? 'not poured' : gramsText(part.actualG, batch.readabilityG),
    lot: batch.lots.find((l) => l.part === i)?.code,
  }));
  const rescue =
    batch.rescue && 'rescueTaken' in batch.steps
      ? batch.rescue.addG
          .map((g, i) => (g > 0 ? `${partLetter(i)} +${gramsText(g, batch.readabilityG)}` : ''))
          .filter(Boolean)
          .join(', ')
      : '';
  const rows: [string, string][] = [
    [
      'Ratio',
      batch.ratioDeviationPct === null
        ? 'not judged'
        : `${deviationPctText(batch.ratioDeviationPct)} (band ±${batch.tolerancePct}\u00a0%)`,
    ],
    ...(rescue ? [['Rescue', `over-pour, then ${rescue}`] as [string, string]] : []),
    ['Mixed by', batch.operator.name],
    ...(batch.handledBy?.length
      ? [
          ['Also', batch.handledBy.map((h) => `${h.name} (${h.role})`).join(', ')] as [
            string,
            string,
          ],
        ]
      : []),
    ...(batch.scaleOverride
      ? [['Allowed', `${batch.scaleOverride.by.name}: small for the scale`] as [string, string]]
      : []),
    ['Mixed', batch.savedAt ? formatClock(new Date(batch.savedAt)) : 'not saved'],
    ['Use by', useBy ? formatClock(useBy) : 'no pot life on file'],
  ];

  return (
    <article
      data-print="label"
      aria-label={`Cup label for batch ${batch.id}`}
      className="max-h-[100mm] w-[62mm] overflow-hidden rounded-md border-2 border-black bg-white p-[2.5mm] font-sans text-[8.5pt] leading-tight text-black"
    >
      <header className="flex items-start justify-between gap-[2mm]">
        <div className="min-w-0">
          <p className="text-[15pt] leading-none font-bold">Batch {batch.id}</p>
          <p className="mt-[1mm] font-semibold [overflow-wrap:anywhere]">{batch.materialName}</p>
          {/* NO-GO printed white on black: unmistakable on a monochrome label. */}
          <p
            className={`mt-[1mm] inline-block text-[13pt] ${batch.verdict === 'NO-GO' ? 'bg-black px-[1.5mm] text-white' : ''}`}
          >
            {batch.verdict ? (
              <VerdictMark verdict={batch.verdict} className="h-[5mm] w-[5mm]" />
            ) : (
              'No verdict'
            )}
          </p>
        </div>
        <QRCodeSVG
          value={url}
          title={url}
          level="M"
          marginSize={0}
          className="h-[18mm] w-[18mm] shrink-0"
        />
      </header>
      <table className="mt-[1.5mm] w-full border-collapse">
        <tbody>
          {parts.map((p) => (
            <tr key={p.name} className="border-t border-black align-top">
              <th scope="row" className="w-[8mm] pr-[1mm] text-left">
                {p.name}
              </th>
              <td className="[overflow-wrap:anywhere]">
                <span className="font-semibold">{p.grams}</span>
                {p.label && <span> {p.label}</span>}
                {p.lot && (
                  <span className="block text-[7pt] [overflow-wrap:anywhere]">lot {p.lot}</span>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <dl className="mt-[1.5mm] grid grid-cols-[15mm_1fr] gap-x-[1.5mm]">
        {rows.map(([term, value], i) => (
          <div key={i} className="contents">
            <dt className="font-semibold">{term}</dt>
            <dd className="[overflow-wrap:anywhere]">{value}</dd>
          </div>
        ))}
      </dl>
    </article>
  );
}
