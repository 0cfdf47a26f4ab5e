// Plotly partial bundle: core (includes the SVG scatter) plus heatmap, under a third of the full bundle.
// No scattergl: it adds ~120 kB gzip; the phase space shows few particles as SVG points and many as a heatmap.
import Plotly from 'plotly.js/lib/core';
import heatmap from 'plotly.js/lib/heatmap';

Plotly.register([heatmap]);

/** The registered Plotly instance used by every view. */
export default Plotly;
