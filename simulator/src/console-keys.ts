import type { SimulatedScale } from './simulated-scale.js';

/** What the keys pour: part A fast, part B slowly and more than needed, so `s` matters. */
export const KEY_POURS = {
  a: { label: 'part A', grams: 100, rateGPerS: 8 },
  b: { label: 'part B', grams: 30, rateGPerS: 2 },
} as const;
const CUP_G = 40;
/** The reference weight `w` places and lifts, as for a scale check. */
export const KEY_WEIGHT_G = 200;

/** One line saying what the balance is doing, for the terminal's status display. */
export function statusLine(scale: SimulatedScale, pouring: string | undefined): string {
  const tare = scale.tareG;
  const parts = [
    scale.plugged ? 'plugged in' : 'UNPLUGGED',
    `gross ${scale.grossG.toFixed(2)} g`,
    tare === undefined ? 'no tare' : `net ${scale.netG.toFixed(2)} g`,
    scale.stable ? 'stable' : 'moving',
    scale.cupPlaced ? 'cup on pan' : 'pan empty',
    scale.weightPlaced ? `${KEY_WEIGHT_G} g weight on pan` : '',
    pouring ? `pouring ${pouring}` : '',
  ];
  return `${parts.filter(Boolean).join(' | ')}   [a b s t l w u q]`;
}

/**
 * Interactive keys on a terminal in raw mode. Returns a function that restores the terminal.
 * `onQuit` is called for q and Ctrl-C.
 */
export function attachKeys(
  scale: SimulatedScale,
  input: NodeJS.ReadStream,
  output: NodeJS.WriteStream,
  onQuit: () => void,
): () => void {
  let pouring: string | undefined;
  const report = (error: Error) => output.write(`\n${error.message}\n`);

  const onKey = (key: string) => {
    switch (key) {
      case 'a':
      case 'b': {
        const pour = KEY_POURS[key];
        pouring = pour.label;
        scale
          .pour(pour.grams, pour.rateGPerS)
          .then(() => {
            if (pouring === pour.label) pouring = undefined;
          })
          .catch(report);
        return;
      }
      case 's':
        pouring = undefined;
        return scale.stopPour();
      case 't':
        return scale.pressTare();
      case 'l':
        if (scale.cupPlaced) return scale.liftCup();
        if (scale.contentsInCupG > 0 || scale.tareG !== undefined) return scale.returnCup();
        return scale.placeCup(CUP_G);
      case 'w':
        return scale.weightPlaced ? scale.liftWeight() : scale.placeWeight(KEY_WEIGHT_G);
      case 'u':
        return scale.plugged ? scale.unplug() : scale.replug();
      case 'q':
      case '\u0003':
        return onQuit();
    }
  };

  input.setRawMode(true);
  input.setEncoding('utf8');
  input.resume();
  const onData = (chunk: string) => {
    for (const key of chunk) onKey(key);
  };
  input.on('data', onData);
  const timer = setInterval(() => {
    output.write(
      `\r${statusLine(scale, pouring).padEnd(output.columns ? output.columns - 1 : 100)}`,
    );
  }, 100);

  return () => {
    clearInterval(timer);
    input.off('data', onData);
    input.setRawMode(false);
    input.pause();
    output.write('\n');
  };
}
