import { shallowRef, type ShallowRef } from 'vue';

/** The Plotly API the plot components use. */
export type PlotlyApi = typeof import('plotly.js-dist-min').default;

let loading: Promise<PlotlyApi> | null = null;
const loaded = shallowRef<PlotlyApi | null>(null);

/**
 * Loads the app's plotly.js bundle (components/plots/plotlyBundle.ts: core + the trace types used, ≈ 0.35 MB
 * brotli) once, on first use, through a dynamic import so that it is its own chunk and only pages that draw a
 * plot pay for it.
 * @returns the Plotly API
 */
export function loadPlotly(): Promise<PlotlyApi> {
  if (!loading) {
    loading = import('@/components/plots/plotlyBundle')
      .then((mod) => {
        const api = ((mod as { default?: PlotlyApi }).default ?? (mod as unknown as PlotlyApi)) as PlotlyApi;
        loaded.value = api;
        return api;
      })
      .catch((err: unknown) => {
        loading = null; // let a later plot try again (e.g. after a network blip)
        throw err;
      });
  }
  return loading;
}

/**
 * Lazy access to plotly.js for plot components.
 * @returns `plotly` (ref, null until loaded) and `load()`
 */
export function usePlotly(): { plotly: Readonly<ShallowRef<PlotlyApi | null>>; load: () => Promise<PlotlyApi> } {
  return { plotly: loaded, load: loadPlotly };
}
