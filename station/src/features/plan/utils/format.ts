import {
  convertMass,
  convertVolume,
  unitLabel,
  type MassUnit,
  type VolumeUnit,
} from '@tareline/protocol';

const numberFormats = new Map<number, Intl.NumberFormat>();

/** A number with thousands separators and a fixed number of decimals (display only). */
export function formatNumber(value: number, decimals: number): string {
  let format = numberFormats.get(decimals);
  if (!format) {
    format = new Intl.NumberFormat('en-US', {
      minimumFractionDigits: decimals,
      maximumFractionDigits: decimals,
    });
    numberFormats.set(decimals, format);
  }
  return format.format(value);
}

/** Fewer decimals as numbers grow, so a reading stays short but small masses keep their grams. */
function decimalsForMagnitude(value: number): number {
  const magnitude = Math.abs(value);
  if (magnitude < 10) return 2;
  if (magnitude < 10_000) return 1;
  return 0;
}

function signed(text: string, sign: '' | '+' | '−'): string {
  return sign ? `${sign} ${text}` : text;
}

export function formatVolume(cm3: number, unit: VolumeUnit, sign: '' | '+' | '−' = ''): string {
  const value = unit === 'cm3' ? cm3 : convertVolume({ value: cm3, unit: 'cm3' }, unit).value;
  return signed(`${formatNumber(value, decimalsForMagnitude(value))} ${unitLabel(unit)}`, sign);
}

export function formatMass(grams: number, unit: MassUnit, sign: '' | '+' | '−' = ''): string {
  const value = unit === 'g' ? grams : convertMass({ value: grams, unit: 'g' }, unit).value;
  const decimals = unit === 'lb' ? 3 : decimalsForMagnitude(value);
  return signed(`${formatNumber(value, decimals)} ${unitLabel(unit)}`, sign);
}

/** Imperial mass: ounces below a pound, pounds above. */
export function formatImperialMass(grams: number, sign: '' | '+' | '−' = ''): string {
  return formatMass(
    grams,
    grams < convertMass({ value: 1, unit: 'lb' }, 'g').value ? 'oz' : 'lb',
    sign,
  );
}
