import { materialInputSchema, type Material, type MaterialPatch } from '@tareline/protocol';
import { z } from 'zod';

/** Three boxes for every per-part list; the form shows the first `partCount`. */
type Three = [string, string, string];

/**
 * What the material form holds: text as typed. Field names follow the schema's paths
 * (`ratio.parts.1`), so the hub's and the schema's errors land on the right box.
 */
export interface MaterialFormValues {
  partCount: '2' | '3';
  name: string;
  ratio: { basis: 'weight' | 'volume'; parts: Three };
  alsoStatedRatio: { parts: Three };
  specificGravity: string;
  yieldIn3PerLb: string;
  partSpecificGravities: Three;
  partLabels: Three;
  tolerancePct: string;
  potLifeMin: string;
  potLifeMassG: string;
  demoldMin: string;
  agitateMin: string;
  openShelfLifeDays: string;
  storageNote: string;
  sdsRef: string;
  /** One caution per line. */
  cautions: string;
  costPerKg: Three;
  lowStockG: Three;
}

export type MaterialFormOutput = z.output<typeof materialInputSchema>;

const text = (n: number | undefined) => (n === undefined ? '' : String(n));
const three = (list: readonly (number | string)[] | undefined): Three => [
  String(list?.[0] ?? ''),
  String(list?.[1] ?? ''),
  String(list?.[2] ?? ''),
];

/** A blank form, or a material's values to edit. */
export function toFormValues(m?: Material): MaterialFormValues {
  return {
    partCount: m?.ratio.parts.length === 3 ? '3' : '2',
    name: m?.name ?? '',
    ratio: { basis: m?.ratio.basis ?? 'weight', parts: three(m?.ratio.parts) },
    alsoStatedRatio: { parts: three(m?.alsoStatedRatio?.parts) },
    specificGravity: text(m?.specificGravity),
    yieldIn3PerLb: text(m?.yieldIn3PerLb),
    partSpecificGravities: three(m?.partSpecificGravities),
    // A material without its own labels shows the defaults; saving them keeps the same names.
    partLabels: three(m?.partLabels),
    tolerancePct: text(m?.tolerancePct),
    potLifeMin: text(m?.potLifeMin),
    potLifeMassG: text(m?.potLifeMassG),
    demoldMin: text(m?.demoldMin),
    agitateMin: text(m?.agitateMin),
    openShelfLifeDays: text(m?.openShelfLifeDays),
    storageNote: m?.storageNote ?? '',
    sdsRef: m?.sdsRef ?? '',
    cautions: (m?.cautions ?? []).join('\n'),
    costPerKg: three(m?.costPerKg),
    lowStockG: three(m?.lowStockG),
  };
}

/** "1,5" reads as 1.5; nothing typed is nothing; anything else goes on for the schema to name. */
function num(raw: string): number | string | undefined {
  const t = raw.trim();
  if (t === '') return undefined;
  const n = Number(t.replace(',', '.'));
  return Number.isFinite(n) ? n : t;
}

const opt = (raw: string) => (raw.trim() === '' ? undefined : raw);

/** The form's text as the schema's input: blank boxes left out, a list only when any is filled. */
export function fromForm(v: MaterialFormValues): Record<string, unknown> {
  const count = v.partCount === '3' ? 3 : 2;
  const list = <T>(boxes: Three, read: (s: string) => T | undefined) => {
    const values = boxes.slice(0, count).map(read);
    return values.every((x) => x === undefined) ? undefined : values;
  };
  const alsoParts = list(v.alsoStatedRatio.parts, num);
  const out: Record<string, unknown> = {
    name: v.name,
    ratio: { basis: v.ratio.basis, parts: list(v.ratio.parts, num) ?? [] },
    alsoStatedRatio: alsoParts && {
      basis: v.ratio.basis === 'weight' ? 'volume' : 'weight',
      parts: alsoParts,
    },
    specificGravity: num(v.specificGravity),
    yieldIn3PerLb: num(v.yieldIn3PerLb),
    partSpecificGravities: list(v.partSpecificGravities, num),
    partLabels: list(v.partLabels, opt),
    tolerancePct: num(v.tolerancePct),
    potLifeMin: num(v.potLifeMin),
    potLifeMassG: num(v.potLifeMassG),
    demoldMin: num(v.demoldMin),
    agitateMin: num(v.agitateMin),
    openShelfLifeDays: num(v.openShelfLifeDays),
    storageNote: opt(v.storageNote),
    sdsRef: opt(v.sdsRef),
    cautions: v.cautions
      .split('\n')
      .map((line) => line.trim())
      .filter(Boolean),
    costPerKg: list(v.costPerKg, num),
    lowStockG: list(v.lowStockG, num),
  };
  return Object.fromEntries(Object.entries(out).filter(([, x]) => x !== undefined));
}

/** The protocol's material schema, read from the form's text. */
export const materialFormSchema = z.preprocess(
  (v: MaterialFormValues) => fromForm(v),
  materialInputSchema,
);

const CLEARABLE = [
  'specificGravity',
  'yieldIn3PerLb',
  'partSpecificGravities',
  'partLabels',
  'potLifeMin',
  'potLifeMassG',
  'sdsRef',
  'openShelfLifeDays',
  'alsoStatedRatio',
  'demoldMin',
  'storageNote',
  'costPerKg',
  'lowStockG',
] as const;

/** An edit sends every field; one left blank is sent as null, which clears it. */
export function toPatch(values: MaterialFormOutput): MaterialPatch {
  const patch: Record<string, unknown> = { ...values };
  for (const key of CLEARABLE) if (patch[key] === undefined) patch[key] = null;
  return patch as MaterialPatch;
}
