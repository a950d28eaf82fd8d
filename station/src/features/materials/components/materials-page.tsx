import type { Lot, Material } from '@tareline/protocol';
import { useRef, useState, type ChangeEvent } from 'react';
import { Link } from 'react-router-dom';
import { CheckField } from '../../../components/form/field';
import { ApiRequestError } from '../../../lib/api-client';
import { stockText } from '../../../lib/grams';
import { partName } from '../../../lib/parts';
import {
  downloadLibraryCsv,
  useAllLots,
  useImportLibrary,
  useMaterialLibrary,
  useUpdateMaterial,
} from '../api/materials';
import { primary, secondary } from './buttons';
import { LotsPanel } from './lots-panel';
import { MaterialForm } from './material-form';

type Panel = { kind: 'add' } | { kind: 'edit' | 'lots'; id: string } | null;

const ratioText = (m: Material) =>
  `${m.ratio.parts.join(' : ')} by ${m.ratio.basis === 'weight' ? 'weight' : 'volume'}`;

/** What the import answered: how many changed, or each bad row. */
type ImportNotice =
  | { ok: true; text: string }
  | { ok: false; text: string; rows: { path: string; message: string }[] };

/** The shop's materials for leads: add, edit, retire, stock of each lot, and the library file. */
export function MaterialsPage() {
  const [showRetired, setShowRetired] = useState(false);
  const materials = useMaterialLibrary(showRetired);
  const lots = useAllLots();
  const update = useUpdateMaterial();
  const importLibrary = useImportLibrary();
  const [panel, setPanel] = useState<Panel>(null);
  const [notice, setNotice] = useState<ImportNotice | null>(null);
  const fileInput = useRef<HTMLInputElement>(null);
  const lotsOf = (id: string): Lot[] => (lots.data ?? []).filter((l) => l.materialId === id);
  const selected =
    panel && panel.kind !== 'add' ? materials.data?.find((m) => m.id === panel.id) : undefined;

  const onFile = async (event: ChangeEvent<HTMLInputElement>) => {
    const file = event.target.files?.[0];
    event.target.value = '';
    if (!file) return;
    try {
      const result = await importLibrary.mutateAsync(await file.text());
      setNotice({
        ok: true,
        text: `Imported ${file.name}: ${result.created} added, ${result.updated} updated.`,
      });
    } catch (error) {
      setNotice({
        ok: false,
        text: error instanceof Error ? error.message : 'The import failed',
        rows: error instanceof ApiRequestError ? error.body.errors : [],
      });
    }
  };

  const toggleActive = async (m: Material) => {
    try {
      await update.mutateAsync({ id: m.id, active: !m.active });
      setNotice({
        ok: true,
        text: m.active
          ? `${m.name} is retired: hidden at the bench, its batches kept.`
          : `${m.name} is in use again.`,
      });
    } catch (error) {
      setNotice({
        ok: false,
        text: error instanceof Error ? error.message : 'Not saved',
        rows: [],
      });
    }
  };

  return (
    <section aria-labelledby="materials-title" className="mx-auto flex max-w-6xl flex-col gap-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 id="materials-title" className="text-3xl font-bold">
          Materials
        </h1>
        <div className="flex flex-wrap gap-3">
          <button type="button" className={primary} onClick={() => setPanel({ kind: 'add' })}>
            Add material
          </button>
          <button
            type="button"
            className={secondary}
            onClick={() =>
              void downloadLibraryCsv().catch((error: unknown) =>
                setNotice({
                  ok: false,
                  text: error instanceof Error ? error.message : 'The export failed',
                  rows: [],
                }),
              )
            }
          >
            Export CSV
          </button>
          <button type="button" className={secondary} onClick={() => fileInput.current?.click()}>
            Import CSV
          </button>
          <input
            ref={fileInput}
            type="file"
            accept=".csv,text/csv"
            aria-label="Library file to import"
            className="hidden"
            onChange={(e) => void onFile(e)}
          />
        </div>
      </div>
      {notice && (
        <div role={notice.ok ? 'status' : 'alert'} className="rounded-lg bg-panel p-4">
          <p className={notice.ok ? 'font-semibold' : 'font-semibold text-over'}>{notice.text}</p>
          {!notice.ok && notice.rows.length > 0 && (
            <ul className="mt-2 list-disc pl-6">
              {notice.rows.map((r) => (
                <li key={`${r.path}:${r.message}`}>{r.message}</li>
              ))}
            </ul>
          )}
        </div>
      )}
      <CheckField label="Show retired materials" checked={showRetired} onChange={setShowRetired} />
      {materials.isPending && <p>Loading materials…</p>}
      {materials.error && <p role="alert">Could not load materials: {materials.error.message}</p>}
      {panel?.kind === 'add' && <MaterialForm onDone={() => setPanel(null)} />}
      {panel?.kind === 'edit' && selected && (
        <MaterialForm key={selected.id} material={selected} onDone={() => setPanel(null)} />
      )}
      {panel?.kind === 'lots' && selected && (
        <LotsPanel material={selected} lots={lotsOf(selected.id)} />
      )}
      {materials.data && (
        <table className="w-full border-collapse bg-panel text-left">
          <thead>
            <tr className="border-b-2 border-line">
              <th className="p-2">Name</th>
              <th className="p-2">Mix ratio</th>
              <th className="p-2">On hand</th>
              <th className="p-2">Status</th>
              <th className="p-2">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {materials.data.map((m) => {
              const own = lotsOf(m.id);
              const low = own.filter((l) => l.warnings.some((w) => w.code === 'LOT_LOW_STOCK'));
              return (
                <tr key={m.id} className="border-b border-line align-top">
                  <td className="p-2 font-semibold">{m.name}</td>
                  <td className="p-2">{ratioText(m)}</td>
                  <td className="p-2">
                    {m.weightRatio.map((_, part) => (
                      <p key={part} className="tabular-nums">
                        {partName(part, m.partLabels[part])}:{' '}
                        {stockText(
                          own.filter((l) => l.part === part).reduce((g, l) => g + l.onHandG, 0),
                        )}
                      </p>
                    ))}
                    {low.map((l) => (
                      <p key={l.id} className="font-semibold text-over">
                        ⚠ {l.warnings.find((w) => w.code === 'LOT_LOW_STOCK')!.message}
                      </p>
                    ))}
                  </td>
                  <td className="p-2">{m.active ? 'in use' : 'retired'}</td>
                  <td className="flex flex-wrap gap-2 p-2">
                    <button
                      type="button"
                      className={secondary}
                      aria-label={`Edit ${m.name}`}
                      onClick={() => setPanel({ kind: 'edit', id: m.id })}
                    >
                      Edit
                    </button>
                    <button
                      type="button"
                      className={secondary}
                      aria-label={`Lots of ${m.name}`}
                      onClick={() => setPanel({ kind: 'lots', id: m.id })}
                    >
                      Lots
                    </button>
                    <Link
                      className={`${secondary} inline-flex items-center`}
                      aria-label={`Safety and data sheets of ${m.name}`}
                      to={`/materials/${m.id}/documents`}
                    >
                      Sheets
                    </Link>
                    <button
                      type="button"
                      className={secondary}
                      aria-label={`${m.active ? 'Retire' : 'Bring back'} ${m.name}`}
                      onClick={() => void toggleActive(m)}
                    >
                      {m.active ? 'Retire' : 'Bring back'}
                    </button>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      )}
    </section>
  );
}
