import { overdrawWarning, splitTotalG, type Lot, type Material } from '@tareline/protocol';
import { useId, useState } from 'react';
import { useLots } from '../api/get-lots';
import { useCodeScanner } from '../../../hooks/use-code-scanner';
import { stockText } from '../../../lib/grams';
import { partName } from '../../../lib/parts';
import { primaryButton } from './buttons';
import { HubError } from './hub-error';

/** Lot codes by part (0 = part A); an empty code is no lot. */
export type LotCodes = Record<number, string>;

const same = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();

/**
 * Step 3: the lot of each part, scanned from its label or picked from the shelf list, with the
 * hub's warnings for expired, long-open or low lots, and a lot that holds less than this batch
 * needs of its part. Lots are optional.
 */
export function LotsStep({
  material,
  totalMassG,
  codes,
  onChange,
  onDone,
}: {
  material: Material;
  /** The batch's total, to warn of a lot that holds less than its part needs. */
  totalMassG?: number | undefined;
  codes: LotCodes;
  onChange: (codes: LotCodes) => void;
  onDone: () => void;
}) {
  const lots = useLots(material.id);
  const parts = material.weightRatio.map((_, i) => i);
  const needG = totalMassG ? splitTotalG(totalMassG, material.weightRatio) : undefined;
  const [lastScan, setLastScan] = useState<string>();

  useCodeScanner(
    (code) => {
      // A code on the shelf list goes to its own part; any other to the first part still open.
      const known = lots.data?.find((l) => same(l.code, code));
      const part = known?.part ?? parts.find((p) => !codes[p]?.trim()) ?? 0;
      onChange({ ...codes, [part]: known?.code ?? code });
      setLastScan(
        `Scanned ${known?.code ?? code} for ${partName(part, material.partLabels[part])}`,
      );
      // Lot codes can be shorter than badge codes.
    },
    { minLength: 3 },
  );

  return (
    <div className="flex flex-col gap-6">
      <p className="text-xl">
        Scan the label on each container, or pick its lot from the list. Lots are optional.
      </p>
      {lastScan && (
        <p role="status" className="text-xl font-semibold">
          {lastScan}
        </p>
      )}
      <HubError error={lots.error} what="The shelf list is not available" />
      <div className="grid gap-6 lg:grid-cols-2">
        {parts.map((part) => (
          <PartLot
            key={part}
            title={partName(part, material.partLabels[part])}
            code={codes[part] ?? ''}
            shelf={(lots.data ?? []).filter((l) => l.part === part)}
            needG={needG?.[part]}
            onCode={(code) => onChange({ ...codes, [part]: code })}
          />
        ))}
      </div>
      <div>
        <button type="button" onClick={onDone} className={primaryButton}>
          Next: prepare
        </button>
      </div>
    </div>
  );
}

function PartLot({
  title,
  code,
  shelf,
  needG,
  onCode,
}: {
  title: string;
  code: string;
  shelf: Lot[];
  needG: number | undefined;
  onCode: (code: string) => void;
}) {
  const id = useId();
  const chosen = code.trim() ? shelf.find((l) => same(l.code, code)) : undefined;
  const overdraw = chosen && needG !== undefined ? overdrawWarning(chosen, needG) : undefined;
  const warnings = chosen ? [...chosen.warnings, ...(overdraw ? [overdraw] : [])] : [];
  return (
    <section aria-labelledby={`${id}-title`} className="rounded-2xl bg-panel p-5 ring-1 ring-line">
      <h3 id={`${id}-title`} className="text-2xl font-bold">
        {title}
      </h3>
      <label htmlFor={id} className="mt-3 block text-lg font-semibold">
        Lot code, {title}
      </label>
      <input
        id={id}
        type="text"
        autoComplete="off"
        value={code}
        onChange={(e) => onCode(e.target.value)}
        className="mt-1 h-14 w-full rounded-xl border-2 border-line bg-paper px-4 text-2xl font-semibold focus:border-steel focus:outline-none"
      />
      {code.trim() && !chosen && (
        <p className="mt-2 text-lg">Not on the shelf list: it is recorded as scanned.</p>
      )}
      {warnings.map((w) => (
        <p
          key={w.code}
          role="alert"
          className="mt-2 flex items-center gap-3 rounded-lg bg-brass px-4 py-2 text-xl font-semibold text-ink"
        >
          <span aria-hidden="true" className="text-2xl">
            ⚠
          </span>
          {w.message}
        </p>
      ))}
      {shelf.length > 0 && (
        <div
          role="group"
          aria-label={`Lots of ${title} on the shelf`}
          className="mt-4 flex flex-wrap gap-3"
        >
          {shelf.map((lot) => {
            const picked = chosen?.id === lot.id;
            return (
              <button
                key={lot.id}
                type="button"
                aria-pressed={picked}
                onClick={() => onCode(picked ? '' : lot.code)}
                className={`min-h-14 rounded-xl px-5 text-xl font-semibold ring-2 ring-inset ${picked ? 'bg-steel text-paper ring-steel' : 'bg-paper ring-line'}`}
              >
                {lot.code}
                {lot.warnings.length > 0 && <span className="ml-2">⚠</span>}
                {lot.expiresOn && (
                  <span className="block text-base font-normal">use by {lot.expiresOn}</span>
                )}
                <span className="block text-base font-normal">
                  {stockText(lot.onHandG)} on hand
                </span>
              </button>
            );
          })}
        </div>
      )}
    </section>
  );
}
