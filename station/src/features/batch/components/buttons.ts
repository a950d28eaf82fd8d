/** Touch targets for gloved hands: at least 56 px high (min-h-14), large words. */
export const primaryButton =
  'min-h-14 rounded-xl bg-steel px-8 text-2xl font-semibold text-paper disabled:bg-line disabled:text-muted';
export const secondaryButton =
  'min-h-14 rounded-xl bg-panel px-8 text-2xl font-semibold text-ink ring-2 ring-line ring-inset disabled:text-muted';
export const dangerButton =
  'min-h-14 rounded-xl bg-over px-8 text-2xl font-semibold text-paper disabled:bg-line disabled:text-muted';
