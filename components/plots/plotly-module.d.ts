// plotly.js-dist-min ships no types; the workspace uses the small surface typed in plotly-loader.ts.
declare module "plotly.js-dist-min";
