import './plotlyGlobal';
import Plotly from 'plotly.js/lib/core';
import heatmap from 'plotly.js/lib/heatmap';
import scatter from 'plotly.js/lib/scatter';
import scatterpolar from 'plotly.js/lib/scatterpolar';
import type { PlotlyApi } from '@/composables/usePlotly';

/**
 * The app's own plotly.js bundle: the core and only the trace types the plots use (scatter lines, polar lines,
 * the stiffness heat map). The full distribution carries every trace type (maps, 3-D, finance …) and is about
 * four times larger; the partial ones lack either heat maps or polar plots. A plot needing another trace type
 * registers it here. Loaded with `import()` by usePlotly only, so it is its own chunk.
 */
(Plotly as unknown as { register(modules: unknown[]): void }).register([scatter, scatterpolar, heatmap]);

export default Plotly as unknown as PlotlyApi;
