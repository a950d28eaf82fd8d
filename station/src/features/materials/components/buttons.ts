const button = 'min-h-11 rounded-lg px-4 font-semibold';
export const primary = `${button} bg-steel text-paper`;
export const secondary = `${button} border-2 border-line bg-panel`;
