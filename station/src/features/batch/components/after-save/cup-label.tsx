import type { Batch } from '@tareline/protocol';
import { QRCodeSVG } from 'qrcode.react';
import { formatClock } from '../../../../lib/countdown';
import { gramsText } from '../../../../lib/grams';
import { partLetter, partName } from '../../../../lib/parts';
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
  const rows: [string, string][] = [
    ...batch.parts.map((part, i): [string, string] => [
      partName(i, part.label),
      part.actualG === null ? 'not poured' : gramsText(part.actualG, batch.readabilityG),
    ]),
    ...batch.lots.map((lot): [string, string] => [`Lot ${partLetter(lot.part)}`, lot.code]),
    [
      'Ratio',
      batch.ratioDeviationPct === null
        ? 'not judged'
        : `${deviationPctText(batch.ratioDeviationPct)} (band ±${batch.tolerancePct}\u00a0%)`,
    ],
    ['Operator', batch.operator.name],
    ['Mixed', batch.savedAt ? formatClock(new Date(batch.savedAt)) : 'not saved'],
    ['Use by', useBy ? formatClock(useBy) : 'no pot life on file'],
  ];

  return (
    <article
      data-print="label"
      aria-label={`Cup label for batch ${batch.id}`}
      className="w-[62mm] rounded-md border-2 border-black bg-white p-[3mm] font-sans text-[9pt] leading-snug text-black"
    >
      <header className="flex items-start justify-between gap-[2mm]">
        <div className="min-w-0">
          <p className="text-[16pt] leading-none font-bold">Batch {batch.id}</p>
          <p className="mt-[1mm] font-semibold break-words">{batch.materialName}</p>
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
      <dl className="mt-[2mm] grid grid-cols-[20mm_1fr] gap-x-[2mm]">
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
