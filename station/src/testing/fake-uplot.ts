/**
 * uPlot draws on a canvas, which jsdom has not got. Tests get this stand-in with the same
 * constructor: it keeps each chart's options and data so a test can read what would be drawn.
 */
export interface DrawnChart {
  options: { series?: { label?: string }[]; bands?: { series: [number, number] }[] };
  data: readonly (readonly (number | null | undefined)[])[];
}

export const drawnCharts: DrawnChart[] = [];

export default class FakeUPlot {
  constructor(options: DrawnChart['options'], data: DrawnChart['data']) {
    drawnCharts.push({ options, data });
  }
  setSize(): void {}
  destroy(): void {}
}
