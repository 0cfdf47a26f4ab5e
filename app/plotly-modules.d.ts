// Types for the Plotly partial-bundle entry points (they ship no declarations of their own).
type PlotlyTraceModule = Exclude<Parameters<typeof import('plotly.js').register>[0], unknown[]>;
declare module 'plotly.js/lib/core' {
  import * as P from 'plotly.js';
  export default P;
}
declare module 'plotly.js/lib/heatmap' {
  const m: PlotlyTraceModule;
  export default m;
}
declare module 'plotly.js/lib/scattergl' {
  const m: PlotlyTraceModule;
  export default m;
}
