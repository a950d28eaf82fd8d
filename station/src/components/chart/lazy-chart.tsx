import { lazy, Suspense, type ComponentProps } from 'react';

const UPlotChart = lazy(() => import('./uplot-chart'));

/** The chart, loaded when first drawn; its box keeps its height meanwhile. */
export function Chart(props: ComponentProps<typeof UPlotChart>) {
  return (
    <Suspense fallback={<div style={{ height: props.height ?? 260 }} aria-hidden="true" />}>
      <UPlotChart {...props} />
    </Suspense>
  );
}
