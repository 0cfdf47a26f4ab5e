// Plotly partial bundle: core (includes scatter) plus heatmap and scattergl, a third of the full bundle.
import Plotly from 'plotly.js/lib/core';
import heatmap from 'plotly.js/lib/heatmap';
import scattergl from 'plotly.js/lib/scattergl';

Plotly.register([heatmap, scattergl]);

/** The registered Plotly instance used by every view. */
export default Plotly;
