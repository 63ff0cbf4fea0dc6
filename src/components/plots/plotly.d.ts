// plotly.js ships no types for its source modules. This declares the small part of its API the plot components
// use, under the module name the plot components import their types from ('plotly.js-dist-min': type-only
// imports, erased at build; the code itself comes from plotlyBundle.ts). The source entries used by the bundle
// are declared at the end.
declare module 'plotly.js-dist-min' {
  /** A Plotly trace (scatter, scatterpolar, heatmap …); kept open because traces have hundreds of options. */
  export type PlotTrace = Record<string, unknown>;
  /** Layout options. */
  export type PlotLayout = Record<string, unknown>;
  /** Config options. */
  export type PlotConfig = Record<string, unknown>;
  /** The div Plotly draws into; after a draw it carries the traces it shows. */
  export interface PlotlyHTMLElement extends HTMLElement {
    data?: PlotTrace[];
    layout?: PlotLayout;
  }
  export function react(el: HTMLElement, data: PlotTrace[], layout?: PlotLayout, config?: PlotConfig): Promise<PlotlyHTMLElement>;
  export function newPlot(el: HTMLElement, data: PlotTrace[], layout?: PlotLayout, config?: PlotConfig): Promise<PlotlyHTMLElement>;
  export function purge(el: HTMLElement): void;
  export function toImage(el: HTMLElement, opts: { format: 'svg' | 'png'; width?: number; height?: number }): Promise<string>;
  export const Plots: { resize(el: HTMLElement): Promise<void> | void };
  const Plotly: {
    react: typeof react;
    newPlot: typeof newPlot;
    purge: typeof purge;
    toImage: typeof toImage;
    Plots: typeof Plots;
  };
  export default Plotly;
}

declare module 'plotly.js/lib/core' {
  const Plotly: unknown;
  export default Plotly;
}
declare module 'plotly.js/lib/scatter' {
  const trace: unknown;
  export default trace;
}
declare module 'plotly.js/lib/scatterpolar' {
  const trace: unknown;
  export default trace;
}
declare module 'plotly.js/lib/heatmap' {
  const trace: unknown;
  export default trace;
}
